/**
 * Sluice's visual identity: warm paper, deep ink, a teal "channel" colour for actions and
 * a small set of state colours (ok, review, fault, held). Type is Source Sans 3, shipped
 * with the app.
 */
/** @type {import('tailwindcss').Config} */
export default {
  content: ['./src/**/*.{astro,html,js,jsx,ts,tsx,md}'],
  theme: {
    extend: {
      colors: {
        ink: { DEFAULT: '#15232b', soft: '#3d4f59', faint: '#6b7c85' },
        paper: { DEFAULT: '#f7f6f1', raised: '#ffffff', sunk: '#ecebe4', line: '#d9d7cc' },
        channel: {
          50: '#eaf6f5',
          100: '#cde9e7',
          200: '#9fd3cf',
          300: '#68b7b2',
          400: '#3d9a95',
          500: '#217e7a',
          600: '#176663',
          700: '#14524f',
          800: '#123f3e',
          900: '#0e2e2d',
        },
        state: {
          ok: '#2f7d46',
          okbg: '#e5f3e8',
          review: '#a4650a',
          reviewbg: '#fbf0dc',
          fault: '#b3352b',
          faultbg: '#f9e4e1',
          held: '#5b5a8f',
          heldbg: '#ebebf6',
        },
      },
      fontFamily: {
        sans: ['"Source Sans 3"', 'system-ui', 'sans-serif'],
        mono: ['ui-monospace', 'SFMono-Regular', 'Menlo', 'monospace'],
      },
      fontSize: {
        xs: ['0.78rem', { lineHeight: '1.1rem' }],
        sm: ['0.875rem', { lineHeight: '1.3rem' }],
        base: ['1rem', { lineHeight: '1.55rem' }],
        lg: ['1.15rem', { lineHeight: '1.65rem' }],
        xl: ['1.4rem', { lineHeight: '1.9rem' }],
        '2xl': ['1.8rem', { lineHeight: '2.3rem' }],
        '3xl': ['2.4rem', { lineHeight: '2.8rem' }],
      },
      borderRadius: { DEFAULT: '0.3rem', lg: '0.5rem' },
      boxShadow: { card: '0 1px 2px rgba(21,35,43,0.06), 0 1px 6px rgba(21,35,43,0.05)' },
      maxWidth: { page: '80rem' },
    },
  },
  plugins: [],
};

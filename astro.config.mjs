import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwind from '@astrojs/tailwind';
import { defineConfig } from 'astro/config';
import { httpFront } from './src/http-front/integration.mjs';

const port = Number(process.env.PORT ?? 4321);
const host = process.env.HOST ?? '127.0.0.1';

export default defineConfig({
  output: 'server',
  // Several builds may share one machine (parallel test runs): each can have its own folder.
  outDir: process.env.SLUICE_BUILD_DIR ?? 'dist',
  adapter: node({ mode: 'standalone' }),
  // <build>/server/entry.mjs is Sluice's HTTP front (client address from the socket, JSON
  // cross-site refusals for the API); the adapter's own entry is app.mjs beside it.
  build: { serverEntry: 'app.mjs' },
  integrations: [react(), tailwind({ applyBaseStyles: false }), httpFront()],
  server: { host, port },
  // Astro's origin check stays on; it needs the served hosts listed to trust the Host header.
  security: {
    checkOrigin: true,
    allowedDomains: [
      { protocol: 'http', hostname: '127.0.0.1' },
      { protocol: 'http', hostname: 'localhost' },
      ...(process.env.SLUICE_PUBLIC_URL
        ? [{ protocol: new URL(process.env.SLUICE_PUBLIC_URL).protocol.replace(':', ''), hostname: new URL(process.env.SLUICE_PUBLIC_URL).hostname }]
        : []),
    ],
  },
  vite: {
    resolve: { alias: { '~': new URL('./src', import.meta.url).pathname } },
    ssr: { external: ['pg-boss', 'pg', 'nodemailer', 'smtp-server'] },
  },
  devToolbar: { enabled: false },
  telemetry: false,
});

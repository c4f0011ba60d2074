import { useEffect, useRef, useState, type ReactNode, type RefObject } from 'react';
import { buildChartTheme } from '@visx/xychart';

/** Shared look, sizing and download of the statistics charts. */

export const CHART_COLORS = {
  bar: '#217e7a',
  outside: '#b3352b',
  limit: '#a4650a',
  point: '#176663',
  selected: '#b3352b',
  line: '#3d4f59',
};

const FONT = '"Source Sans 3", system-ui, sans-serif';

export const chartTheme = buildChartTheme({
  backgroundColor: '#ffffff',
  colors: [CHART_COLORS.bar, CHART_COLORS.limit, CHART_COLORS.line],
  gridColor: '#d9d7cc',
  gridColorDark: '#6b7c85',
  tickLength: 4,
  svgLabelSmall: { fill: '#3d4f59', fontSize: 11, fontFamily: FONT },
  svgLabelBig: { fill: '#15232b', fontSize: 12, fontFamily: FONT, fontWeight: 600 },
  htmlLabel: { color: '#15232b', fontSize: 13, fontFamily: FONT },
  xAxisLineStyles: { stroke: '#6b7c85' },
  yAxisLineStyles: { stroke: '#6b7c85' },
  xTickLineStyles: { stroke: '#6b7c85' },
  yTickLineStyles: { stroke: '#6b7c85' },
});

/** Width of an element, following resizes; `fallback` until measured (and on the server). */
export function useWidth(ref: RefObject<HTMLElement | null>, fallback = 520): number {
  const [width, setWidth] = useState(fallback);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const update = () => setWidth(Math.max(240, Math.floor(el.getBoundingClientRect().width)));
    update();
    const ro = new ResizeObserver(update);
    ro.observe(el);
    return () => ro.disconnect();
  }, [ref]);
  return width;
}

function chartSvgText(container: HTMLElement, title: string): { text: string; width: number; height: number } | null {
  const svg = container.querySelector('svg');
  if (!svg) return null;
  const clone = svg.cloneNode(true) as SVGSVGElement;
  const width = Number(svg.getAttribute('width')) || svg.getBoundingClientRect().width;
  const height = Number(svg.getAttribute('height')) || svg.getBoundingClientRect().height;
  clone.setAttribute('xmlns', 'http://www.w3.org/2000/svg');
  clone.setAttribute('width', String(width));
  clone.setAttribute('height', String(height));
  clone.setAttribute('font-family', FONT);
  const ns = 'http://www.w3.org/2000/svg';
  const t = document.createElementNS(ns, 'title');
  t.textContent = title;
  const bg = document.createElementNS(ns, 'rect');
  bg.setAttribute('width', '100%');
  bg.setAttribute('height', '100%');
  bg.setAttribute('fill', '#ffffff');
  clone.insertBefore(bg, clone.firstChild);
  clone.insertBefore(t, clone.firstChild);
  return { text: new XMLSerializer().serializeToString(clone), width, height };
}

function saveBlob(blob: Blob, fileName: string) {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

export function downloadChartSvg(container: HTMLElement, title: string, fileName: string) {
  const svg = chartSvgText(container, title);
  if (svg) saveBlob(new Blob([svg.text], { type: 'image/svg+xml' }), `${fileName}.svg`);
}

/** Draws the chart's SVG on a canvas at twice its size and saves it as PNG. */
export function downloadChartPng(container: HTMLElement, title: string, fileName: string) {
  const svg = chartSvgText(container, title);
  if (!svg) return;
  const img = new Image();
  const url = URL.createObjectURL(new Blob([svg.text], { type: 'image/svg+xml' }));
  img.onload = () => {
    const canvas = document.createElement('canvas');
    canvas.width = svg.width * 2;
    canvas.height = svg.height * 2;
    const ctx = canvas.getContext('2d')!;
    ctx.scale(2, 2);
    ctx.drawImage(img, 0, 0);
    URL.revokeObjectURL(url);
    canvas.toBlob((b) => b && saveBlob(b, `${fileName}.png`), 'image/png');
  };
  img.src = url;
}

/** A titled chart with SVG and PNG download buttons; `children(width)` draws the chart. */
export function ChartCard({
  title,
  subtitle,
  fileName,
  height,
  children,
}: {
  title: string;
  subtitle?: ReactNode;
  fileName: string;
  height: number;
  children: (width: number) => ReactNode;
}) {
  const ref = useRef<HTMLDivElement>(null);
  const width = useWidth(ref);
  return (
    <figure className="card p-4 min-w-0" aria-label={title}>
      <figcaption className="flex flex-wrap items-baseline justify-between gap-2 mb-1">
        <span className="font-semibold">{title}</span>
        <span className="flex gap-1">
          <button type="button" className="btn-quiet px-2 py-0.5 text-xs" onClick={() => ref.current && downloadChartSvg(ref.current, title, fileName)}>
            SVG
          </button>
          <button type="button" className="btn-quiet px-2 py-0.5 text-xs" onClick={() => ref.current && downloadChartPng(ref.current, title, fileName)}>
            PNG
          </button>
        </span>
      </figcaption>
      {subtitle && <p className="text-xs text-ink-faint mb-1">{subtitle}</p>}
      <div ref={ref} style={{ height }} className="w-full">
        {children(width)}
      </div>
    </figure>
  );
}

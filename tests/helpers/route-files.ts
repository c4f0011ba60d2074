/** The route files under src/pages, with the methods each serves and a path that reaches it. */
import fs from 'node:fs';
import path from 'node:path';
import { HTTP_METHODS, routeOfFile, type RouteFile } from '~/lib/route-files';

const PAGES = path.resolve(import.meta.dirname, '../../src/pages');

export interface RouteFileInfo extends RouteFile {
  /** Methods served: GET for pages; the exported handlers of an endpoint (ALL stands for GET and POST here). */
  methods: string[];
  /** A concrete path: `[param]` → `0` (no row has it), `[...rest]` → `x/y`. */
  sample: string;
  isApi: boolean;
}

function walk(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? walk(path.join(dir, e.name)) : [path.join(dir, e.name)]));
}

export function routeFiles(): RouteFileInfo[] {
  return walk(PAGES)
    .filter((f) => /\.(astro|ts)$/.test(f))
    .map((f) => {
      const r = routeOfFile(`src/pages/${path.relative(PAGES, f).split(path.sep).join('/')}`);
      const text = fs.readFileSync(f, 'utf8');
      let methods: string[];
      if (f.endsWith('.astro')) methods = ['GET'];
      else {
        const exported = HTTP_METHODS.filter((m) => new RegExp(`export\\s+(const|async\\s+function|function)\\s+${m}\\b`).test(text));
        methods = exported.includes('ALL') ? ['GET', 'POST'] : [...exported];
      }
      const sample = r.route.replace(/\[\.\.\.[^\]]+\]/g, 'x/y').replace(/\[[^\]]+\]/g, '0');
      return { ...r, methods, sample, isApi: r.route.startsWith('/api/') };
    })
    .sort((a, b) => a.route.localeCompare(b.route));
}

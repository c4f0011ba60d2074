/**
 * Pages and API routes as files under src/pages: the URL pattern each file serves, the same
 * way Astro maps files to routes (`[id]` one segment, `[...all]` the rest, `index` the folder).
 * Used by the middleware (405 with Allow, JSON 404 for unknown API paths) and by the tests
 * that keep the access rules and the route files in step.
 */
export interface RouteFile {
  /** The file, relative to src/pages, e.g. `api/bins/[id]/index.ts`. */
  file: string;
  /** The route as Astro writes it, e.g. `/api/bins/[id]`. */
  route: string;
  pattern: RegExp;
  /** Dynamic segments: with several matches, the one with fewest wins (Astro prefers static). */
  dynamicSegments: number;
}

export function routeOfFile(file: string): RouteFile {
  const rel = file.replace(/^.*?src\/pages\//, '').replace(/^\/+/, '');
  const noExt = rel.replace(/\.(astro|ts|js|mjs|md)$/, '');
  const segments = noExt.split('/').filter((s, i, all) => !(s === 'index' && i === all.length - 1));
  let dynamicSegments = 0;
  const parts = segments.map((s) => {
    if (/^\[\.\.\.[^\]]+\]$/.test(s)) {
      dynamicSegments++;
      return '(?:/.*)?';
    }
    dynamicSegments += (s.match(/\[[^\]]+\]/g) ?? []).length;
    const body = s
      .split(/(\[[^\]]+\])/)
      .map((piece) => (/^\[[^\]]+\]$/.test(piece) ? '[^/]+' : piece.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')))
      .join('');
    return `/${body}`;
  });
  const route = `/${segments.join('/')}`;
  const pattern = parts.length ? new RegExp(`^${parts.join('')}/?$`) : /^\/$/;
  return { file: rel, route, pattern, dynamicSegments };
}

/** The route file that serves `pathname`, the most specific when several match. */
export function matchRouteFile(files: readonly RouteFile[], pathname: string): RouteFile | undefined {
  return files.filter((f) => f.pattern.test(pathname)).sort((a, b) => a.dynamicSegments - b.dynamicSegments)[0];
}

/** HTTP methods an endpoint module exports (`ALL` stands for every method). */
export const HTTP_METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE', 'ALL'] as const;

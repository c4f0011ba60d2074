/**
 * The OpenAPI document served at /api/openapi.json against the route files under src/pages/api:
 * every file's path and every method it exports must be described, and nothing else. Checked
 * against the OpenAPI 3.1 specification's required fields (openapi, info, paths; a responses
 * object per operation) and JSON Schema 2020-12 as its schema dialect.
 */
import { describe, expect, it } from 'vitest';
import { API_OPERATIONS, buildOpenApiDocument, openApiPath } from '~/lib/server/openapi';
import { routeFiles } from '../helpers/route-files';

const doc = buildOpenApiDocument() as {
  openapi: string;
  jsonSchemaDialect: string;
  info: { title: string; version: string };
  paths: Record<string, Record<string, { summary: string; responses: Record<string, unknown>; requestBody?: unknown }>>;
  components: { schemas: Record<string, unknown> };
};

const apiRoutes = routeFiles().filter((r) => r.isApi);
const served = apiRoutes.flatMap((r) => r.methods.map((m) => `${m} ${openApiPath(r.route)}`)).sort();
const described = Object.entries(doc.paths)
  .flatMap(([path, item]) => Object.keys(item).map((m) => `${m.toUpperCase()} ${path}`))
  .sort();

describe('OpenAPI document', () => {
  it('is OpenAPI 3.1 with JSON Schema 2020-12 (the 3.1 specification)', () => {
    expect(doc.openapi).toBe('3.1.0');
    expect(doc.jsonSchemaDialect).toBe('https://json-schema.org/draft/2020-12/schema');
    expect(doc.info.title).toBeTruthy();
    expect(apiRoutes.length).toBeGreaterThan(50);
  });

  it('describes every route file under src/pages/api and every method it exports', () => {
    expect(served.filter((op) => !described.includes(op))).toEqual([]);
  });

  it('describes no route or method that no file serves', () => {
    expect(described.filter((op) => !served.includes(op))).toEqual([]);
  });

  it('gives every operation a summary, a success answer and the error answer', () => {
    for (const [path, item] of Object.entries(doc.paths)) {
      for (const [method, op] of Object.entries(item)) {
        expect(op.summary, `${method} ${path}`).toBeTruthy();
        expect(Object.keys(op.responses), `${method} ${path}`).toContain('default');
        expect(Object.keys(op.responses).some((s) => /^2\d\d$/.test(s)), `${method} ${path}`).toBe(true);
      }
    }
  });

  it('takes the named contracts from src/contracts and resolves every reference', () => {
    expect(Object.keys(doc.components.schemas)).toEqual(expect.arrayContaining(['PartsPage', 'PartDetailJson', 'BinStockPage', 'BinPlanList', 'BinPlanPreview', 'StatisticsReport', 'ProposalView', 'MixerEstimateJson']));
    const refs = [...JSON.stringify(doc).matchAll(/"\$ref":"#\/components\/schemas\/([^"]+)"/g)].map((m) => m[1]);
    expect(refs.length).toBeGreaterThan(20);
    expect(refs.filter((r) => !(r in doc.components.schemas))).toEqual([]);
  });

  it('shows a contract field by its JSON name (a part row has idss_a and bin_code)', () => {
    const row = (doc.components.schemas.PartsPage as { properties: { parts: { items: { properties: Record<string, unknown>; required: string[] } } } }).properties.parts.items;
    expect(row.required).toEqual(expect.arrayContaining(['serial', 'idss_a', 'bin_code', 'location']));
  });

  it('gives every JSON answer its contract, except better-auth\'s routes and this document itself', () => {
    const generic = Object.entries(API_OPERATIONS).flatMap(([path, methods]) =>
      Object.entries(methods)
        .filter(([, op]) => !op!.response && !op!.produces)
        .map(([method]) => `${method.toUpperCase()} ${path}`),
    );
    expect(generic.sort()).toEqual(['GET /api/auth/{all}', 'GET /api/openapi.json', 'POST /api/auth/{all}']);
  });

  it('keeps the table and the document in step', () => {
    expect(Object.keys(API_OPERATIONS).sort()).toEqual(Object.keys(doc.paths).sort());
  });
});

/**
 * The OpenAPI document served at /api/openapi.json against the route files under src/pages/api:
 * every file's path and every method it exports must be described, and nothing else. Checked
 * against the OpenAPI 3.1 specification's required fields (openapi, info, paths; a responses
 * object per operation) and JSON Schema 2020-12 as its schema dialect. Every request a route reads
 * (a JSON body, a query) is described by a contract exported from src/contracts, the same schema
 * the service parses with.
 */
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
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
const PAGES = path.resolve(import.meta.dirname, '../../src/pages');
const CONTRACTS = path.resolve(import.meta.dirname, '../../src/contracts');
const sourceOf = (file: string) => fs.readFileSync(path.join(PAGES, file), 'utf8');

/** Every schema exported from src/contracts, by identity. */
const contractSchemas = new Set<unknown>();
for (const file of fs.readdirSync(CONTRACTS).filter((f) => f.endsWith('.ts'))) {
  const mod = (await import(path.join(CONTRACTS, file))) as Record<string, unknown>;
  for (const value of Object.values(mod)) if (value instanceof z.ZodType) contractSchemas.add(value);
}

/**
 * Writes that take no JSON body of a contract's, each with why. Everything else that a route
 * serves with POST, PUT or PATCH names its body's contract.
 */
const WRITES_WITHOUT_JSON_BODY: Record<string, string> = {
  'POST /api/auth/{all}': "better-auth's own routes: it reads and checks its bodies with its own schemas",
  'POST /api/sweeps': 'a multipart upload: `file` parts, the text fields described by the `form` contract (UploadTags)',
  'POST /api/reservations/{id}/cancel': 'takes no body: the reservation is the path',
};
const WRITE_METHODS = ['POST', 'PUT', 'PATCH'];
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

  it('gives every POST, PUT and PATCH a request body contract from src/contracts, except the writes listed with a reason', () => {
    const missing: string[] = [];
    const notContract: string[] = [];
    for (const [p, methods] of Object.entries(API_OPERATIONS)) {
      for (const [method, op] of Object.entries(methods)) {
        const key = `${method.toUpperCase()} ${p}`;
        if (!WRITE_METHODS.includes(method.toUpperCase()) || key in WRITES_WITHOUT_JSON_BODY) continue;
        if (!op!.body) missing.push(key);
        else if (!contractSchemas.has(op!.body)) notContract.push(key);
      }
    }
    expect(missing, 'writes without a request body contract').toEqual([]);
    expect(notContract, 'bodies not exported from src/contracts (a service schema, an inline z.object, an .omit())').toEqual([]);
    for (const key of Object.keys(WRITES_WITHOUT_JSON_BODY)) {
      const [method, p] = key.split(' ');
      expect(API_OPERATIONS[p]?.[method.toLowerCase() as 'post'], `${key} is listed but not served`).toBeTruthy();
      expect(API_OPERATIONS[p]![method.toLowerCase() as 'post']!.body, `${key} is listed without a body yet has one`).toBeUndefined();
    }
    expect(contractSchemas.has(API_OPERATIONS['/api/sweeps'].post!.form)).toBe(true);
  });

  it('describes the body of every route file that reads JSON, and the query of every route that reads its search parameters, from src/contracts', () => {
    const bodyless: string[] = [];
    const queryless: string[] = [];
    for (const r of apiRoutes) {
      const text = sourceOf(r.file);
      const ops = API_OPERATIONS[openApiPath(r.route)] ?? {};
      const served = r.methods.map((m) => ops[m.toLowerCase() as 'get']);
      if (/\breadJson\(/.test(text) && !served.some((op) => op?.body && contractSchemas.has(op.body))) bodyless.push(r.file);
      if (/\bsearchParams\b/.test(text) && !served.some((op) => op?.query && [op.query].flat().every((q) => contractSchemas.has(q)))) queryless.push(r.file);
    }
    expect(bodyless, 'route files that read a JSON body no contract describes').toEqual([]);
    expect(queryless, 'route files that read search parameters no contract describes').toEqual([]);
  });

  it('shows a request body by its contract (a device type\'s limits, a bin plan draft)', () => {
    const body = (p: string, m: string) => (doc.paths[p][m].requestBody as { content: Record<string, { schema: { $ref?: string } }> }).content['application/json'].schema.$ref;
    expect(body('/api/admin/device-types', 'post')).toBe('#/components/schemas/DeviceTypeInput');
    expect(body('/api/admin/users/{id}/roles', 'put')).toBe('#/components/schemas/SetRolesRequest');
    expect(body('/api/review/{serial}/refit', 'post')).toBe('#/components/schemas/RefitRequest');
    expect(body('/api/bin-plans/preview', 'post')).toBe('#/components/schemas/BinPlanDraft');
  });

  it('keeps the table and the document in step', () => {
    expect(Object.keys(API_OPERATIONS).sort()).toEqual(Object.keys(doc.paths).sort());
  });
});

import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { AppError, ERROR_CATALOGUE, ERROR_KINDS, type ErrorCode } from '~/core/errors';
import { CurveFamilyShapeError } from '~/core/fit/prepared-curves';
import { fitCurveFamily } from '~/core/fit/fit-curve-family';
import { STATUS_OF_KIND, toResponse } from '~/lib/server/errors';

/** One error type, one catalogue, one toResponse: the rules of DEVELOPERS.md ("Errors"), checked. */

const ROOT = join(__dirname, '..', '..');
const SRC = join(ROOT, 'src');

function sourceFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return sourceFiles(path);
    return /\.(ts|tsx|astro|mjs)$/.test(name) ? [path] : [];
  });
}

// The HTTP front's .mjs files are copied as they are beside the built server (integration.mjs)
// and run before the app is loaded: they cannot import the TypeScript catalogue.
const OUTSIDE_THE_APP = /^src\/http-front\/.*\.mjs$/;

const FILES = sourceFiles(SRC)
  .map((path) => ({ path: relative(ROOT, path).split('\\').join('/'), text: readFileSync(path, 'utf8') }))
  .filter((f) => !OUTSIDE_THE_APP.test(f.path));

describe('the catalogue', () => {
  const codes = Object.keys(ERROR_CATALOGUE) as ErrorCode[];

  it.each(codes)('%s has a kind with a status and a message', (code) => {
    const entry = ERROR_CATALOGUE[code];
    expect(ERROR_KINDS).toContain(entry.kind);
    expect(STATUS_OF_KIND[entry.kind]).toBeGreaterThanOrEqual(400);
    expect(typeof entry.message).toBe('function');
    if (entry.message.length === 0) expect((entry.message as () => string)().length).toBeGreaterThan(10);
  });

  it('gives every kind a status', () => {
    for (const kind of ERROR_KINDS) expect(STATUS_OF_KIND[kind]).toBeGreaterThanOrEqual(400);
  });
});

describe('sources', () => {
  // `class X extends Y` anywhere in src: X is an AppError when Y is, however deep.
  const parents = new Map<string, string>();
  for (const f of FILES) {
    for (const m of f.text.matchAll(/class\s+(\w+)(?:<[^>{]*>)?\s+extends\s+(\w+)/g)) parents.set(m[1]!, m[2]!);
  }
  const isAppError = (name: string): boolean => {
    for (let n: string | undefined = name, depth = 0; n && depth < 10; n = parents.get(n), depth++) if (n === 'AppError') return true;
    return false;
  };

  it('throw only AppError or its subclasses', () => {
    const offenders = FILES.flatMap((f) =>
      [...f.text.matchAll(/throw\s+new\s+(\w+)/g)].filter((m) => !isAppError(m[1]!)).map((m) => `${f.path}: throw new ${m[1]}`),
    );
    expect(offenders).toEqual([]);
  });

  it('build no error body by hand on the server: answers go through toResponse / errorBody', () => {
    const server = FILES.filter((f) => /^src\/(pages\/|lib\/|middleware\.ts)/.test(f.path) && f.path !== 'src/lib/server/errors.ts');
    const offenders = server.filter((f) => /error\s*:\s*\{\s*code\s*:/.test(f.text)).map((f) => f.path);
    expect(offenders).toEqual([]);
  });

  it('write no message next to an error code: `new AppError(code, …)` takes parameters, not text', () => {
    const offenders = FILES.flatMap((f) =>
      [...f.text.matchAll(/new\s+AppError(?:<[^>]*>)?\(\s*'\w+'\s*,\s*[`'"]/g)].map((m) => `${f.path}: ${m[0]}`),
    );
    expect(offenders).toEqual([]);
  });
});

describe('toResponse', () => {
  const body = async (res: Response) => ((await res.json()) as { error: Record<string, unknown> }).error;

  it('keeps the status and code clients have always seen, and adds the permanent reason', async () => {
    const res = toResponse(new AppError('part_not_found', { serial: 'JX-1' }));
    expect(res.status).toBe(404);
    expect(await body(res)).toEqual({
      code: 'not_found',
      reason: 'part_not_found',
      message: 'No part with serial JX-1. Check the serial on the label, or search the parts list.',
    });
  });

  it('spreads the details beside the message', async () => {
    const res = toResponse(new AppError('permission_missing', { need: 'fits:review' }, { missing: 'fits:review' }));
    expect(res.status).toBe(403);
    expect(await body(res)).toMatchObject({ code: 'forbidden', missing: 'fits:review', message: 'Your roles do not allow this (it needs fits:review).' });
  });

  it('answers curves no fit can read with 422 and the reason (a refit of malformed stored curves)', async () => {
    let thrown: unknown;
    try {
      fitCurveFamily({ curves: [{ vgsV: 0, points: { vdsV: [1, 2], idA: [1] } }] }, { vdsTestV: 10 });
    } catch (err) {
      thrown = err;
    }
    expect(thrown).toBeInstanceOf(CurveFamilyShapeError);
    const res = toResponse(thrown);
    expect(res.status).toBe(422);
    expect(await body(res)).toMatchObject({ code: 'unprocessable', reason: 'curve_family_shape', message: expect.stringMatching(/each point needs both/) });
  });

  it('answers a zod error as validation_failed, naming fields in words', async () => {
    const parsed = z.object({ lo: z.object({ amplitude_v: z.number().positive() }) }).safeParse({ lo: { amplitude_v: -1 } });
    const res = toResponse(parsed.error);
    expect(res.status).toBe(400);
    expect(await body(res)).toMatchObject({ code: 'invalid_input', reason: 'validation_failed', fields: [{ field: 'lo.amplitude_v' }] });
  });

  it('hides an unexpected error behind unexpected (500)', async () => {
    const log = console.error;
    console.error = () => undefined;
    try {
      const res = toResponse(new TypeError('secret detail'));
      expect(res.status).toBe(500);
      expect(await body(res)).toEqual({ code: 'internal', reason: 'unexpected', message: 'Something went wrong on the server; it has been logged.' });
    } finally {
      console.error = log;
    }
  });

  it('keeps a relayed status and headers', async () => {
    const res = toResponse(new AppError('request_refused', { text: '', status: 415 }), { status: 415, headers: { 'x-a': '1' } });
    expect(res.status).toBe(415);
    expect(res.headers.get('x-a')).toBe('1');
    expect((await body(res)).message).toBe('The request was refused (415).');
  });
});

import type { APIContext, APIRoute } from 'astro';
import { MAX_ROW_ID, parseRowId } from '~/core/ids/row-id';
import { AppError, json, toResponse } from './errors';
import { actorFromLocals, type Actor } from './identity';

/** The most a JSON request body may hold; bigger ones are refused (413) while they stream in. */
export const MAX_JSON_BODY_BYTES = 1024 * 1024;

/** Wraps an endpoint body: gives it the actor, maps thrown errors to JSON responses. */
export function endpoint(handler: (ctx: APIContext, actor: Actor | null) => Promise<Response | unknown>): APIRoute {
  return async (ctx) => {
    try {
      const out = await handler(ctx, actorFromLocals(ctx.locals));
      return out instanceof Response ? out : json(out);
    } catch (err) {
      return toResponse(err);
    }
  };
}

function tooLarge(what: string, limit: number): AppError {
  return new AppError('body_too_large', { what, limitBytes: limit }, { limit_bytes: limit });
}

/**
 * The whole body, read as it streams in and refused (413) as soon as it passes `limit` bytes,
 * whatever Content-Length said (or when there was none: chunked requests).
 */
export async function readBodyCapped(request: Request, limit: number, what = 'The request body'): Promise<Uint8Array> {
  const declared = Number(request.headers.get('content-length') ?? Number.NaN);
  if (declared > limit) throw tooLarge(what, limit);
  if (!request.body) return new Uint8Array(0);
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge(what, limit);
    }
    chunks.push(value);
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

/**
 * A copy of `request` whose body errors once more than `limit` bytes have streamed through,
 * for readers that take the stream themselves (`formData()`). `exceeded()` tells afterwards
 * whether that is why the reader failed.
 */
export function capRequestBody(request: Request, limit: number): { request: Request; exceeded: () => boolean } {
  let total = 0;
  let over = false;
  if (!request.body) return { request, exceeded: () => false };
  const counted = request.body.pipeThrough(
    new TransformStream<Uint8Array, Uint8Array>({
      transform(chunk, controller) {
        total += chunk.byteLength;
        if (total > limit) {
          over = true;
          controller.error(new Error(`body larger than ${limit} bytes`));
          return;
        }
        controller.enqueue(chunk);
      },
    }),
  );
  const init: RequestInit & { duplex: 'half' } = { method: request.method, headers: request.headers, body: counted, duplex: 'half' };
  return { request: new Request(request.url, init), exceeded: () => over };
}

/** The JSON path of the first string holding a NUL character (PostgreSQL text cannot store one). */
function nulPath(value: unknown, path: string): string | null {
  if (typeof value === 'string') return value.includes('\u0000') ? path : null;
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const p = nulPath(value[i], `${path}[${i}]`);
      if (p) return p;
    }
    return null;
  }
  if (value && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) {
      if (k.includes('\u0000')) return `${path}.${k}`;
      const p = nulPath(v, path ? `${path}.${k}` : k);
      if (p) return p;
    }
  }
  return null;
}

/**
 * Reads a JSON body of at most 1 MiB (refused with 413 while streaming past it), or fails with
 * a message that says the body is not JSON or which field holds a NUL character.
 */
export async function readJson(request: Request): Promise<unknown> {
  const text = new TextDecoder().decode(await readBodyCapped(request, MAX_JSON_BODY_BYTES, 'The JSON body'));
  if (!text.trim()) return {};
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    throw new AppError('body_not_json');
  }
  const bad = nulPath(value, '');
  if (bad !== null) {
    throw new AppError('nul_in_field', { field: bad || '(body)' }, {
      fields: [{ field: bad || '(body)', message: 'contains a NUL character' }],
    });
  }
  return value;
}

export { json };

/** A row id from the URL, else invalid_input naming `what`. */
export function rowId(raw: string | undefined, what: string): number {
  const id = parseRowId(raw);
  if (id === null) throw new AppError('bad_row_id', { raw: raw ?? '', what, max: MAX_ROW_ID });
  return id;
}

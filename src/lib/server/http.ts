import type { APIContext, APIRoute } from 'astro';
import { AppError, json, toResponse } from './errors';
import { actorFromLocals, type Actor } from './identity';

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

/** Reads a JSON body, or fails with a message that says the body is not JSON. */
export async function readJson(request: Request): Promise<unknown> {
  const text = await request.text();
  if (!text.trim()) return {};
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError('invalid_input', 'The request body is not valid JSON.');
  }
}

export { json };

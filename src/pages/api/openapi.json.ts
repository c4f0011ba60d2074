import type { APIRoute } from 'astro';
import { json } from '~/lib/server/http';
import { buildOpenApiDocument } from '~/lib/server/openapi';

let document: Record<string, unknown> | undefined;

/** The OpenAPI 3.1 description of this API, built once from the zod contracts; anyone may read it. */
export const GET: APIRoute = () => json((document ??= buildOpenApiDocument()));

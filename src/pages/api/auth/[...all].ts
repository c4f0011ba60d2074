import type { APIRoute } from 'astro';
import { CLIENT_IP_HEADER, getAuth } from '~/lib/server/auth';
import { toAuthErrorResponse, withSignInGuard } from '~/lib/server/auth-http';

/**
 * better-auth's routes. The client address is Astro's `clientAddress`, which the server entry
 * takes from the socket (or from a trusted proxy's X-Forwarded-For); never from the client.
 * Sign-ins go through the per-account and per-address failure limits; error answers use
 * Sluice's `{ error: { code, message } }` shape.
 */
export const ALL: APIRoute = async ({ request, clientAddress, url }) => {
  const headers = new Headers(request.headers);
  headers.delete(CLIENT_IP_HEADER);
  headers.set(CLIENT_IP_HEADER, clientAddress);
  const forward = (body: BodyInit | null) => {
    const init: RequestInit & { duplex?: 'half' } = { method: request.method, headers };
    if (body !== null && request.method !== 'GET' && request.method !== 'HEAD') {
      init.body = body;
      init.duplex = 'half';
    }
    return getAuth().handler(new Request(request.url, init)).then(toAuthErrorResponse);
  };
  if (request.method === 'POST' && url.pathname === '/api/auth/sign-in/email') {
    return withSignInGuard(request, clientAddress, (bodyText) => forward(bodyText));
  }
  return forward(request.body);
};

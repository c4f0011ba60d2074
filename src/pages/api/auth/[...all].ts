import type { APIRoute } from 'astro';
import { CLIENT_IP_HEADER, getAuth } from '../../../lib/server/auth';

/** better-auth's routes. The client address comes from the socket, never from the client. */
export const ALL: APIRoute = async ({ request, clientAddress }) => {
  const headers = new Headers(request.headers);
  headers.delete(CLIENT_IP_HEADER);
  headers.set(CLIENT_IP_HEADER, clientAddress);
  const init: RequestInit & { duplex?: 'half' } = { method: request.method, headers };
  if (request.method !== 'GET' && request.method !== 'HEAD') {
    init.body = request.body;
    init.duplex = 'half';
  }
  return getAuth().handler(new Request(request.url, init));
};

import type { APIRoute } from 'astro';
import { getAuth } from '../lib/server/auth';

export const POST: APIRoute = async ({ request }) => {
  const res = await getAuth().api.signOut({ headers: request.headers, asResponse: true });
  const headers = new Headers({ location: '/' });
  for (const cookie of res.headers.getSetCookie()) headers.append('set-cookie', cookie);
  return new Response(null, { status: 303, headers });
};

import type { APIRoute } from 'astro';
import { json } from '~/lib/server/errors';

export const GET: APIRoute = ({ locals }) => {
  const u = locals.user;
  return json(u ? { id: u.id, email: u.email, name: u.name, roles: u.roles, permissions: u.permissions } : { station: locals.station });
};

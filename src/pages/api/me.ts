import type { APIRoute } from 'astro';
import type { MeJson } from '~/contracts/session';
import { json } from '~/lib/server/errors';

export const GET: APIRoute = ({ locals }) => {
  const u = locals.user;
  const me: MeJson = u ? { id: u.id, email: u.email, name: u.name, roles: u.roles, permissions: u.permissions } : { station: locals.station };
  return json(me);
};

import { createHash } from 'node:crypto';
import { and, eq, isNull } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import {
  STATION_GRANTS, hasPermission, maySeeOwnedRecord, ownedRecordNeed, ownedRecordScope, parseRoles, permissionsOf, type OwnedRecord, type Permission, type Role,
} from '../access';
import { AppError } from './errors';
import { getAuth } from './auth';

export interface SignedInUser {
  id: string;
  email: string;
  name: string;
  roles: Role[];
  permissions: Permission[];
}

export interface StationIdentity {
  id: string;
  name: string;
}

/** Who is acting: the one thing services receive to check permissions and write the audit log. */
export interface Actor {
  userId: string | null;
  stationId: string | null;
  label: string;
  permissions: readonly Permission[];
}

export function actorFromLocals(locals: App.Locals): Actor | null {
  if (locals.user) {
    return { userId: locals.user.id, stationId: null, label: locals.user.email, permissions: locals.user.permissions };
  }
  if (locals.station) {
    return { userId: null, stationId: locals.station.id, label: `station ${locals.station.name}`, permissions: STATION_GRANTS };
  }
  return null;
}

/** Throws 401/403 as an AppError when the actor lacks the permission. */
export function requirePermission(actor: Actor | null, permission: Permission): asserts actor is Actor {
  if (!actor) throw new AppError('sign_in_required');
  if (!actor.permissions.includes(permission)) {
    throw new AppError('permission_missing', { need: permission }, { missing: permission });
  }
}

/**
 * Which records of one person's kind (access.ts `OwnedRecord`) the actor may see: everyone's or
 * only their own; throws 401/403 as an AppError when none.
 */
export function requireOwnedRecordScope(actor: Actor | null, kind: OwnedRecord): { actor: Actor; scope: 'everyone' | 'own' } {
  if (!actor) throw new AppError('sign_in_required');
  const scope = ownedRecordScope(kind, actor.permissions);
  if (scope === 'none') {
    const need = ownedRecordNeed(kind);
    throw new AppError('permission_missing', { need: need.join(' or ') }, { missing: need[0] });
  }
  return { actor, scope };
}

export { maySeeOwnedRecord };

export async function userFromHeaders(headers: Headers): Promise<SignedInUser | null> {
  const session = await getAuth().api.getSession({ headers });
  if (!session) return null;
  const u = session.user as typeof session.user & { role?: string | null; banned?: boolean | null };
  if (u.banned) return null;
  const roles = parseRoles(u.role);
  return { id: u.id, email: u.email, name: u.name, roles, permissions: permissionsOf(roles) };
}

export function hashStationToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

export async function stationFromBearer(authorization: string | null): Promise<StationIdentity | null> {
  if (!authorization?.startsWith('Bearer ')) return null;
  const token = authorization.slice('Bearer '.length).trim();
  if (!token) return null;
  const db = getDb();
  const rows = await db
    .select({ id: schema.stationToken.id, name: schema.stationToken.name })
    .from(schema.stationToken)
    .where(and(eq(schema.stationToken.tokenSha256, hashStationToken(token)), isNull(schema.stationToken.revokedAt)))
    .limit(1);
  if (!rows[0]) return null;
  await db.update(schema.stationToken).set({ lastUsedAt: new Date() }).where(eq(schema.stationToken.id, rows[0].id));
  return rows[0];
}

export { hasPermission };

import { asc, isNull, eq, and } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { parseRoles } from '~/lib/access';
import { requirePermission, type Actor } from '~/lib/server/identity';
import type { UserJson } from '~/contracts/users';

export async function listUsers({ actor }: { actor: Actor | null }): Promise<UserJson[]> {
  requirePermission(actor, 'users:manage');
  const db = getDb();
  const rows = await db
    .select({ u: schema.user, pending: schema.invitation.id })
    .from(schema.user)
    .leftJoin(schema.invitation, and(eq(schema.invitation.userId, schema.user.id), isNull(schema.invitation.acceptedAt)))
    .orderBy(asc(schema.user.email));
  return rows.map(({ u, pending }) => ({
    id: u.id,
    email: u.email,
    name: u.name,
    roles: parseRoles(u.role),
    disabled: Boolean(u.banned),
    invitationPending: pending !== null,
    createdAt: u.createdAt.toISOString(),
  }));
}

import { eq } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { parseRoles } from '~/lib/access';
import { writeAudit } from '~/lib/server/audit';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { SetRolesInput, type UserRolesSet } from '~/contracts/users';

export async function setUserRoles({ actor, input }: { actor: Actor | null; input: unknown }): Promise<UserRolesSet> {
  requirePermission(actor, 'users:manage');
  const data = SetRolesInput.parse(input);
  if (data.userId === actor.userId && !data.roles.includes('admin')) {
    throw new AppError('own_admin_role');
  }
  return getDb().transaction(async (tx) => {
    const [before] = await tx.select().from(schema.user).where(eq(schema.user.id, data.userId)).for('update');
    if (!before) throw new AppError('person_not_found');
    await tx.update(schema.user).set({ role: data.roles.join(','), updatedAt: new Date() }).where(eq(schema.user.id, data.userId));
    await writeAudit(tx, actor, {
      action: 'user.set_roles',
      subjectType: 'user',
      subjectId: data.userId,
      before: { roles: parseRoles(before.role) },
      after: { roles: data.roles },
    });
    return { id: data.userId, roles: data.roles };
  });
}

import { eq } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { SetDisabledInput, type UserDisabledSet } from '~/contracts/users';

/** Disables (bans) or re-enables an account; disabling also ends its sessions. */
export async function setUserDisabled({ actor, input }: { actor: Actor | null; input: unknown }): Promise<UserDisabledSet> {
  requirePermission(actor, 'users:manage');
  const data = SetDisabledInput.parse(input);
  if (data.userId === actor.userId) throw new AppError('own_account_disabled');
  return getDb().transaction(async (tx) => {
    const [before] = await tx.select().from(schema.user).where(eq(schema.user.id, data.userId)).for('update');
    if (!before) throw new AppError('person_not_found');
    await tx
      .update(schema.user)
      .set({ banned: data.disabled, banReason: data.disabled ? (data.reason ?? 'disabled by an admin') : null, updatedAt: new Date() })
      .where(eq(schema.user.id, data.userId));
    if (data.disabled) await tx.delete(schema.session).where(eq(schema.session.userId, data.userId));
    await writeAudit(tx, actor, {
      action: data.disabled ? 'user.disable' : 'user.enable',
      subjectType: 'user',
      subjectId: data.userId,
      before: { disabled: Boolean(before.banned) },
      after: { disabled: data.disabled },
      reason: data.reason,
    });
    return { id: data.userId, disabled: data.disabled };
  });
}

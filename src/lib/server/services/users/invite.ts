import { randomBytes, randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { getAuth } from '~/lib/server/auth';
import { writeAudit } from '~/lib/server/audit';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { InviteUserInput, type UserInvited } from '~/contracts/users';

/**
 * Creates the account with a random password nobody knows, records the invitation, and mails
 * a link where the invited person chooses their own password.
 */
export async function inviteUser({ actor, input }: { actor: Actor | null; input: unknown }): Promise<UserInvited> {
  requirePermission(actor, 'users:manage');
  const data = InviteUserInput.parse(input);
  const db = getDb();
  const existing = await db.select({ id: schema.user.id }).from(schema.user).where(eq(schema.user.email, data.email));
  if (existing.length) throw new AppError('email_taken', { email: data.email });

  const auth = getAuth();
  const created = await auth.api.createUser({
    body: { email: data.email, name: data.name, password: randomBytes(24).toString('base64url'), role: data.roles },
  });
  await db.transaction(async (tx) => {
    await tx.insert(schema.invitation).values({
      id: randomUUID(),
      email: data.email,
      userId: created.user.id,
      invitedBy: actor.userId,
      roles: data.roles.join(','),
    });
    await writeAudit(tx, actor, {
      action: 'user.invite',
      subjectType: 'user',
      subjectId: created.user.id,
      after: { email: data.email, roles: data.roles },
    });
  });
  await auth.api.requestPasswordReset({ body: { email: data.email, redirectTo: '/set-password' } });
  return { id: created.user.id, email: data.email, roles: data.roles };
}

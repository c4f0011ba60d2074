import { and, eq, gt } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';

/**
 * The e-mail address an invitation or reset link is for, while the link is still valid; null
 * otherwise. Lets the set-password page sign the person in once the password is set, without
 * asking for the address the link already names.
 */
export async function emailForPasswordLink(token: string): Promise<string | null> {
  if (!/^[A-Za-z0-9_-]{8,200}$/.test(token)) return null;
  const [row] = await getDb()
    .select({ email: schema.user.email })
    .from(schema.verification)
    .innerJoin(schema.user, eq(schema.user.id, schema.verification.value))
    .where(and(eq(schema.verification.identifier, `reset-password:${token}`), gt(schema.verification.expiresAt, new Date())));
  return row?.email ?? null;
}

import { randomUUID } from 'node:crypto';
import { inArray, sql } from 'drizzle-orm';
import { AppError } from '~/core/errors';
import { getDb, schema } from '~/db/client';
import { serverEnv } from '~/lib/server/env';

/**
 * Failed sign-ins counted per account (the e-mail as typed, lower-cased) and per client
 * address, in the database so every web process sees the same counts. A count starts afresh
 * when its last failure is older than the window. While either count is at its limit, sign-ins
 * for that account or from that address are refused (429) without checking the password, and
 * a refused attempt is not counted. A successful sign-in clears the account's count, not the
 * address's (else one valid account would reset an attacker's address).
 *
 * Kept in better-auth's `rate_limit` table under keys of our own (`sign-in-failures:…`), which
 * better-auth's own limiter (keys made of address and path) never reads.
 */
export interface SignInSubject {
  email: string;
  address: string;
}

export interface SignInRefusal {
  kind: 'account' | 'address';
  retryAfterS: number;
  error: AppError<'sign_in_limit_account' | 'sign_in_limit_address'>;
}

const accountKey = (email: string) => `sign-in-failures:account:${email.trim().toLowerCase()}`;
const addressKey = (address: string) => `sign-in-failures:address:${address}`;

/** Refusal when the account or the address has used up its failures, else null. */
export async function signInRefusal(subject: SignInSubject, now = Date.now()): Promise<SignInRefusal | null> {
  const env = serverEnv();
  const windowMs = env.signInFailureWindowS * 1000;
  const keys = [accountKey(subject.email), addressKey(subject.address)];
  const rows = await getDb()
    .select({ key: schema.rateLimit.key, count: schema.rateLimit.count, last: schema.rateLimit.lastRequest })
    .from(schema.rateLimit)
    .where(inArray(schema.rateLimit.key, keys));
  for (const r of rows) {
    if (now - r.last >= windowMs) continue;
    const isAccount = r.key === keys[0];
    const limit = isAccount ? env.signInFailuresPerAccount : env.signInFailuresPerAddress;
    if (r.count < limit) continue;
    const retryAfterS = Math.max(1, Math.ceil((r.last + windowMs - now) / 1000));
    const kind = isAccount ? 'account' : 'address';
    const params = { limit, windowMinutes: env.signInFailureWindowS / 60, retryMinutes: Math.ceil(retryAfterS / 60) };
    const error = new AppError(isAccount ? 'sign_in_limit_account' : 'sign_in_limit_address', params, { limit: kind });
    return { kind, retryAfterS, error };
  }
  return null;
}

/** Counts one failed sign-in against the account and the address. */
export async function recordSignInFailure(subject: SignInSubject, now = Date.now()): Promise<void> {
  const windowMs = serverEnv().signInFailureWindowS * 1000;
  for (const key of [accountKey(subject.email), addressKey(subject.address)]) {
    await getDb().execute(sql`
      insert into rate_limit (id, key, count, last_request) values (${randomUUID()}, ${key}, 1, ${now})
      on conflict (key) do update set
        count = case when rate_limit.last_request <= ${now - windowMs} then 1 else rate_limit.count + 1 end,
        last_request = excluded.last_request`);
  }
}

/** A successful sign-in: the account starts with no failures. */
export async function clearAccountFailures(email: string): Promise<void> {
  await getDb().delete(schema.rateLimit).where(inArray(schema.rateLimit.key, [accountKey(email)]));
}

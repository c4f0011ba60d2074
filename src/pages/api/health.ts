import type { APIRoute } from 'astro';
import { sql } from 'drizzle-orm';
import { getDb } from '~/db/client';
import { json } from '~/lib/server/errors';

export const GET: APIRoute = async () => {
  try {
    await getDb().execute(sql`select 1`);
    return json({ ok: true });
  } catch {
    return json({ ok: false, error: { code: 'internal', message: 'The database does not answer.' } }, 503);
  }
};

import { eq } from 'drizzle-orm';
import type { Role } from '~/lib/access';
import { getDb, schema } from '~/db/client';
import { getAuth } from '../auth';

/** The invented lab of the demo scenario: one person per role. */
export const DEMO_PEOPLE: { email: string; name: string; roles: Role[] }[] = [
  { email: 'admin@demo.sluice.test', name: 'Ada Okafor', roles: ['admin'] },
  { email: 'inspector@demo.sluice.test', name: 'Ivo Brandt', roles: ['inspector'] },
  { email: 'designer@demo.sluice.test', name: 'Dana Reyes', roles: ['designer'] },
  { email: 'stores@demo.sluice.test', name: 'Sam Lindqvist', roles: ['stores'] },
];

export const DEFAULT_DEMO_PASSWORD = 'weir-street-demo';

/** Creates each demo person once; leaves existing accounts (and their passwords) alone. */
export async function seedDemoPeople(password: string): Promise<number> {
  const db = getDb();
  let created = 0;
  for (const p of DEMO_PEOPLE) {
    const found = await db.select({ id: schema.user.id }).from(schema.user).where(eq(schema.user.email, p.email));
    if (found.length) continue;
    await getAuth().api.createUser({ body: { email: p.email, name: p.name, password, role: p.roles } });
    await db.update(schema.user).set({ emailVerified: true }).where(eq(schema.user.email, p.email));
    created++;
  }
  return created;
}

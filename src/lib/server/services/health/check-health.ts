import { sql } from 'drizzle-orm';
import { getDb } from '~/db/client';

export interface HealthReport {
  /** The database answered a trivial query. */
  databaseAnswers: boolean;
}

/**
 * Whether the app can serve: the database answers. Public (the start and test scripts and
 * load balancers poll it before anyone signs in), so it takes no actor and says nothing more.
 */
export async function checkHealth(): Promise<HealthReport> {
  try {
    await getDb().execute(sql`select 1`);
    return { databaseAnswers: true };
  } catch {
    return { databaseAnswers: false };
  }
}

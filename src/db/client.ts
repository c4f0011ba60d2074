import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import { serverEnv } from '../lib/server/env';
import * as schema from './schema';

export type Database = NodePgDatabase<typeof schema>;
/** A transaction handle or the database itself: services accept either. */
export type DbOrTx = Database | Parameters<Parameters<Database['transaction']>[0]>[0];

let pool: pg.Pool | undefined;
let database: Database | undefined;

/** The process-wide pool and Drizzle client, created on first use. */
export function getDb(): Database {
  if (!database) {
    pool = new pg.Pool({ connectionString: serverEnv().databaseUrl, max: serverEnv().dbPoolSize });
    database = drizzle(pool, { schema });
  }
  return database;
}

export function getPool(): pg.Pool {
  getDb();
  return pool!;
}

export async function closeDb(): Promise<void> {
  await pool?.end();
  pool = undefined;
  database = undefined;
}

export { schema };

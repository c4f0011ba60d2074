import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import { throttledErrorLog } from './connection-error-log';
import { dbConfig } from './db-config';
import { stopAllNoticeChannels } from './notices';
import * as schema from './schema';

const poolErrorLog = throttledErrorLog('[db] connection lost:');

export type Database = NodePgDatabase<typeof schema>;
/** A transaction handle or the database itself: services accept either. */
export type DbOrTx = Database | Parameters<Parameters<Database['transaction']>[0]>[0];

let pool: pg.Pool | undefined;
let database: Database | undefined;

/** The process-wide pool and Drizzle client, created on first use. */
export function getDb(): Database {
  if (!database) {
    const { databaseUrl, poolSize } = dbConfig();
    pool = new pg.Pool({ connectionString: databaseUrl, max: poolSize });
    // An idle connection that the server closes (a restart, an administrator's kill) is
    // reported here; without a listener that would end the process. The pool drops the
    // connection and opens a new one for the next query.
    pool.on('error', poolErrorLog);
    // The pool listens only to idle connections; a connection lost while checked out (in a
    // transaction) reports here too, instead of as an uncaught 'error' event that ends the
    // process. Its queries fail, and the pool drops it when it is released.
    pool.on('connect', (client) => client.on('error', poolErrorLog));
    database = drizzle(pool, { schema });
  }
  return database;
}

export function getPool(): pg.Pool {
  getDb();
  return pool!;
}

/**
 * A transaction on one pooled connection, handing over both the Drizzle handle and the raw
 * client, for a library that writes through a client of its own (pg-boss queues jobs in the
 * caller's transaction this way). Rolled back when `work` throws.
 */
export async function transactionWithClient<T>(work: (tx: Database, client: pg.PoolClient) => Promise<T>): Promise<T> {
  const client = await getPool().connect();
  let broken = false;
  try {
    await client.query('begin');
    const result = await work(drizzle(client, { schema }) as unknown as Database, client);
    await client.query('commit');
    return result;
  } catch (err) {
    // A connection that cannot even roll back is dropped from the pool, not reused.
    await client.query('rollback').catch(() => (broken = true));
    throw err;
  } finally {
    client.release(broken);
  }
}

export async function closeDb(): Promise<void> {
  await stopAllNoticeChannels();
  await pool?.end();
  pool = undefined;
  database = undefined;
}

export { schema };

// Applies the committed drizzle-kit migrations in drizzle/ to DATABASE_URL.
import { drizzle } from 'drizzle-orm/node-postgres';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import pg from 'pg';

const url = process.env.DATABASE_URL;
if (!url) throw new Error('DATABASE_URL is not set; run through `npm start` or `npm test`.');
const pool = new pg.Pool({ connectionString: url, max: 1 });
try {
  await migrate(drizzle(pool), { migrationsFolder: 'drizzle' });
  console.log(`[sluice] database ${new URL(url).pathname.slice(1)} is migrated`);
} finally {
  await pool.end();
}

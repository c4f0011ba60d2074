// A fitting worker: takes jobs from pg-boss and runs them. `npm start` runs one; start more
// on other machines against the same DATABASE_URL with `npm run worker`.
import { closeDb } from './db/client';
import { getBoss, stopBoss } from './lib/server/jobs/boss';
import { registerJobHandlers } from './lib/server/jobs/handlers';

const boss = await getBoss();
const names = await registerJobHandlers(boss);
console.log(`worker ready: ${names.join(', ')}`);

async function shutdown() {
  await stopBoss();
  await closeDb();
  process.exit(0);
}
process.on('SIGINT', shutdown);
process.on('SIGTERM', shutdown);

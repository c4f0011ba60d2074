// A fitting worker: takes jobs from pg-boss and runs them. `npm start` runs one; start more
// on other machines against the same DATABASE_URL with `npm run worker`.
import { storableText } from './core/text/storable-text';
import { closeDb } from './db/client';
import { getBoss, stopBoss } from './lib/server/jobs/boss';
import { registerJobHandlers } from './lib/server/jobs/handlers';

// A promise nobody awaited that failed is a bug to fix, but one such bug (pg-boss completes
// and fails jobs without awaiting the write) must not stop every other job: it is logged in
// full and the worker goes on. Its job, if any, is retried when it expires.
let unhandled = 0;
process.on('unhandledRejection', (reason) => {
  unhandled++;
  const detail = reason instanceof Error ? (reason.stack ?? reason.message) : String(reason);
  console.error(`[worker] unhandled promise rejection #${unhandled} (a write nobody awaited, or a bug; logged, the worker goes on):\n${storableText(detail, 8000)}`);
});
// A thrown exception nobody caught leaves the process in an unknown state: log it and exit,
// so that the supervisor (`npm start`) starts a fresh worker; the jobs this one held are
// taken up again when they expire.
process.on('uncaughtException', (err, origin) => {
  console.error(`[worker] BUG: ${origin}, the worker exits and is restarted:\n${storableText(err?.stack ?? String(err), 8000)}`);
  process.exit(70);
});

/** Starts pg-boss, waiting for the database when it is not up yet (a restart, a machine booting). */
async function startBoss() {
  for (let attempt = 1; ; attempt++) {
    try {
      return await getBoss();
    } catch (err) {
      const waitS = Math.min(2 ** attempt, 15);
      console.error(`[worker] the database cannot be reached (${storableText(err instanceof Error ? err.message : String(err), 300)}); trying again in ${waitS} s`);
      await new Promise((r) => setTimeout(r, waitS * 1000));
    }
  }
}

const boss = await startBoss();
const names = await registerJobHandlers(boss);
console.log(`worker ready: ${names.join(', ')}`);

let stopping = false;
async function shutdown() {
  if (stopping) return;
  stopping = true;
  await stopBoss();
  await closeDb();
  process.exit(0);
}
process.on('SIGINT', shutdown);
process.on('SIGTERM', shutdown);

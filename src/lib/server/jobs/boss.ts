import PgBoss from 'pg-boss';
import { serverEnv } from '../env';

/** Queue names; each has one handler registered by the worker. */
export const QUEUES = {
  fitUploadFile: 'fit-upload-file',
  expireReservations: 'expire-reservations',
} as const;
export type QueueName = (typeof QUEUES)[keyof typeof QUEUES];

let boss: PgBoss | undefined;
let starting: Promise<PgBoss> | undefined;

/** The process's pg-boss, started on first use, with every queue created. */
export function getBoss(): Promise<PgBoss> {
  if (boss) return Promise.resolve(boss);
  starting ??= (async () => {
    const b = new PgBoss({ connectionString: serverEnv().databaseUrl, max: 4 });
    b.on('error', (err) => console.error('[jobs]', err));
    await b.start();
    // Only missing queues are created: createQueue takes locks that can deadlock with another
    // process starting at the same time (then wait and look again).
    for (const name of Object.values(QUEUES)) {
      for (let attempt = 1; !(await b.getQueue(name)); attempt++) {
        try {
          await b.createQueue(name);
        } catch (err) {
          if ((err as { code?: string }).code !== '40P01' || attempt >= 5) throw err;
          await new Promise((r) => setTimeout(r, 100 * attempt));
        }
      }
    }
    boss = b;
    return b;
  })();
  return starting;
}

export async function stopBoss(): Promise<void> {
  await boss?.stop({ graceful: true, timeout: 10_000 });
  boss = undefined;
  starting = undefined;
}

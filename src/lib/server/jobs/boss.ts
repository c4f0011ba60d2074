import PgBoss from 'pg-boss';
import { serverEnv } from '../env';
import { throttledErrorLog } from '~/db/connection-error-log';

/** Queue names; each has one handler registered by the worker. */
export const QUEUES = {
  fitUploadFile: 'fit-upload-file',
  /** Fitting jobs that failed every attempt (by error or because their worker died): the files are refused. */
  fitUploadFileFailed: 'fit-upload-file-failed',
  expireReservations: 'expire-reservations',
  sendMail: 'send-mail',
} as const;
export type QueueName = (typeof QUEUES)[keyof typeof QUEUES];

/**
 * How long a worker may hold a job before pg-boss takes it as abandoned and retries it. A
 * worker that dies (kill -9, power cut) holds its jobs this long, plus up to one
 * maintenance interval, plus the retry delay; a batch of fitting jobs takes a second or two.
 */
export const JOB_EXPIRE_SECONDS = 30;
/** How often one pg-boss instance on the database looks for expired jobs (maintenance). */
export const MAINTENANCE_INTERVAL_SECONDS = 5;

/** Queue settings applied at every start, so that existing installations get them too. Dead-letter queues first. */
const QUEUE_SETTINGS: [QueueName, Omit<PgBoss.Queue, 'name'>][] = [
  [QUEUES.fitUploadFileFailed, { expireInSeconds: 60, retryLimit: 5, retryDelay: 5 }],
  // Five attempts, waiting about 3, 6, 12 and 24 s (each up to twice that) between them: a
  // database restart of up to ~45 s costs no file.
  [QUEUES.fitUploadFile, { expireInSeconds: JOB_EXPIRE_SECONDS, retryLimit: 4, retryDelay: 3, retryBackoff: true, deadLetter: QUEUES.fitUploadFileFailed }],
  [QUEUES.expireReservations, { expireInSeconds: 120 }],
  // About 2.5 hours of attempts, doubling the wait each time, before a message is given up.
  [QUEUES.sendMail, { expireInSeconds: 60, retryLimit: 12, retryDelay: 5, retryBackoff: true }],
];

let boss: PgBoss | undefined;
let starting: Promise<PgBoss> | undefined;

/** The process's pg-boss, started on first use, with every queue created. */
export function getBoss(): Promise<PgBoss> {
  if (boss) return Promise.resolve(boss);
  starting ??= (async () => {
    const b = new PgBoss({
      connectionString: serverEnv().databaseUrl,
      max: 4,
      maintenanceIntervalSeconds: MAINTENANCE_INTERVAL_SECONDS,
    });
    // A lost database connection makes every fetch loop report here until it is back; pg-boss
    // reconnects by itself, so this logs (a few lines a minute at most) and goes on.
    b.on('error', throttledErrorLog('[jobs]'));
    try {
      await b.start();
      // Only missing queues are created: createQueue takes locks that can deadlock with another
      // process starting at the same time (then wait and look again).
      for (const [name, settings] of QUEUE_SETTINGS) {
        for (let attempt = 1; !(await b.getQueue(name)); attempt++) {
          try {
            await b.createQueue(name, { name, ...settings });
          } catch (err) {
            if ((err as { code?: string }).code !== '40P01' || attempt >= 5) throw err;
            await new Promise((r) => setTimeout(r, 100 * attempt));
          }
        }
        await b.updateQueue(name, { name, ...settings });
      }
    } catch (err) {
      // The next caller tries again (the database may have been down for a moment).
      starting = undefined;
      await b.stop({ graceful: false, wait: false }).catch(() => {});
      throw err;
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

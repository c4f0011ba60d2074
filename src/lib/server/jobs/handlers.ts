import type PgBoss from 'pg-boss';
import { QUEUES } from './boss';
import { FIT_BATCH_SIZE, fitUploadFiles, type FitUploadFileJob } from './fit-upload-file';
import { registerExpireReservations } from './expire-reservations';

/** Parallel fetch loops per worker process: one fits while the other waits on the database. */
const FIT_LOOPS = Number(process.env.SLUICE_FIT_LOOPS ?? 2);

/** Registers every queue's handler on `boss`; returns the queue names being worked. */
export async function registerJobHandlers(boss: PgBoss): Promise<string[]> {
  for (let i = 0; i < FIT_LOOPS; i++) {
    let id = '';
    id = await boss.work<FitUploadFileJob>(
      QUEUES.fitUploadFile,
      { batchSize: FIT_BATCH_SIZE, pollingIntervalSeconds: 0.5, includeMetadata: true },
      async (jobs) => {
        await fitUploadFiles(jobs);
        // A full batch means more are waiting: fetch again at once instead of after the poll delay.
        if (jobs.length === FIT_BATCH_SIZE && id) boss.notifyWorker(id);
      },
    );
  }
  return [QUEUES.fitUploadFile, await registerExpireReservations(boss)];
}

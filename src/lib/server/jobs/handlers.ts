import type PgBoss from 'pg-boss';
import { serverEnv } from '../env';
import { QUEUES } from './boss';
import { FIT_BATCH_SIZE, fitUploadFiles, refuseDeadFitJobs, type FitUploadFileJob } from './fit-upload-file';
import { registerExpireReservations } from './expire-reservations';
import { guardJobHandler } from './job-failure';
import { sendQueuedMail } from './send-mail';
import type { OutgoingMail } from '../mail';

/** Registers every queue's handler on `boss`; returns the queue names being worked. */
export async function registerJobHandlers(boss: PgBoss): Promise<string[]> {
  // Parallel fetch loops (SLUICE_FIT_LOOPS, 2 by default): one fits while the other waits on the database.
  for (let i = 0; i < serverEnv().fitLoops; i++) {
    let id = '';
    const fit = guardJobHandler(QUEUES.fitUploadFile, fitUploadFiles);
    id = await boss.work<FitUploadFileJob>(
      QUEUES.fitUploadFile,
      { batchSize: FIT_BATCH_SIZE, pollingIntervalSeconds: 0.5, includeMetadata: true },
      async (jobs) => {
        await fit(jobs);
        // A full batch means more are waiting: fetch again at once instead of after the poll delay.
        if (jobs.length === FIT_BATCH_SIZE && id) boss.notifyWorker(id);
      },
    );
  }
  await boss.work<FitUploadFileJob>(
    QUEUES.fitUploadFileFailed,
    { batchSize: FIT_BATCH_SIZE, pollingIntervalSeconds: 2, includeMetadata: true },
    guardJobHandler(QUEUES.fitUploadFileFailed, refuseDeadFitJobs),
  );
  // One message per job: a failed batch would send its delivered messages again.
  await boss.work<OutgoingMail>(QUEUES.sendMail, { batchSize: 1, pollingIntervalSeconds: 2 }, guardJobHandler(QUEUES.sendMail, sendQueuedMail));
  return [QUEUES.fitUploadFile, QUEUES.fitUploadFileFailed, QUEUES.sendMail, await registerExpireReservations(boss)];
}

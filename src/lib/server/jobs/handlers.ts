import type PgBoss from 'pg-boss';
import { QUEUES } from './boss';
import { FIT_BATCH_SIZE, fitUploadFiles, refuseDeadFitJobs, type FitUploadFileJob } from './fit-upload-file';
import { registerExpireReservations } from './expire-reservations';
import { guardJobHandler } from './job-failure';
import { sendQueuedMail } from './send-mail';
import type { OutgoingMail } from '../mail';

/** Parallel fetch loops per worker process: one fits while the other waits on the database. */
const FIT_LOOPS = Number(process.env.SLUICE_FIT_LOOPS ?? 2);

/** Registers every queue's handler on `boss`; returns the queue names being worked. */
export async function registerJobHandlers(boss: PgBoss): Promise<string[]> {
  for (let i = 0; i < FIT_LOOPS; i++) {
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

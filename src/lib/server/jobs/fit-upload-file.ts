import type PgBoss from 'pg-boss';
import { storableText } from '~/core/text/storable-text';
import { ingestStoredFiles, refuseAfterRepeatedFailure } from '../services/intake/ingest-stored-file';
import { JOB_EXPIRE_SECONDS } from './boss';
import { JobFailure } from './job-failure';

export interface FitUploadFileJob {
  uploadFileId: number;
}

/** Jobs fetched per round trip: enough to keep a worker busy, small enough to retry cheaply. */
export const FIT_BATCH_SIZE = 50;

/**
 * Works a batch of fitting jobs: every file is parsed and fitted, then the batch is stored a
 * few transactions at a time. A file that cannot be used is marked rejected by the service
 * (that is not a job failure); only unexpected errors throw, and pg-boss retries the batch —
 * files already done are left alone on the next run. On a job's last attempt its file is
 * refused with the error, so that nothing stays queued for ever. What is thrown is always a
 * `JobFailure`, which pg-boss can store.
 */
export async function fitUploadFiles(jobs: PgBoss.JobWithMetadata<FitUploadFileJob>[]): Promise<void> {
  try {
    await ingestStoredFiles(jobs.map((job) => job.data.uploadFileId));
  } catch (err) {
    const lastAttempt = jobs.filter((job) => job.retryCount >= job.retryLimit).map((job) => job.data.uploadFileId);
    try {
      await refuseAfterRepeatedFailure(lastAttempt, err);
    } catch (refuseErr) {
      // The dead-letter job refuses these files once the database takes writes again.
      console.error(`[jobs] could not refuse upload file(s) ${lastAttempt.join(', ')} after their last attempt:`, storableText(String(refuseErr)));
    }
    throw new JobFailure('fit-upload-file', err);
  }
}

/** pg-boss's own failure text for a job whose worker never finished it. */
const EXPIRED_MESSAGE = 'job failed by timeout in active state';

/**
 * Works the dead-letter queue of fitting: jobs that failed every attempt, by an error or
 * because the worker holding them died or hung each time. Their files, if still queued, are
 * refused with a stored reason; a file already refused by the last attempt is left as it is.
 */
export async function refuseDeadFitJobs(jobs: PgBoss.JobWithMetadata<FitUploadFileJob>[]): Promise<void> {
  const byReason = new Map<string, number[]>();
  for (const job of jobs) {
    const output = job.output as { message?: unknown; value?: { message?: unknown } } | null;
    const message = String(output?.message ?? output?.value?.message ?? 'no error was recorded');
    const reason =
      message === EXPIRED_MESSAGE ? `the worker fitting it stopped, or took longer than ${JOB_EXPIRE_SECONDS} s, on every attempt` : message;
    byReason.set(reason, [...(byReason.get(reason) ?? []), job.data.uploadFileId]);
  }
  for (const [reason, ids] of byReason) await refuseAfterRepeatedFailure(ids, new Error(reason));
}

import type PgBoss from 'pg-boss';
import { ingestStoredFiles, refuseAfterRepeatedFailure } from '../services/intake/ingest-stored-file';

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
 * refused with the error, so that nothing stays queued for ever.
 */
export async function fitUploadFiles(jobs: PgBoss.JobWithMetadata<FitUploadFileJob>[]): Promise<void> {
  try {
    await ingestStoredFiles(jobs.map((job) => job.data.uploadFileId));
  } catch (err) {
    const lastAttempt = jobs.filter((job) => job.retryCount >= job.retryLimit).map((job) => job.data.uploadFileId);
    await refuseAfterRepeatedFailure(lastAttempt, err);
    throw err;
  }
}

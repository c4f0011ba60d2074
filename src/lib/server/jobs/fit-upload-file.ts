import type PgBoss from 'pg-boss';
import { ingestStoredFiles } from '../services/intake/ingest-stored-file';

export interface FitUploadFileJob {
  uploadFileId: number;
}

/** Jobs fetched per round trip: enough to keep a worker busy, small enough to retry cheaply. */
export const FIT_BATCH_SIZE = 50;

/**
 * Works a batch of fitting jobs: every file is parsed and fitted, then the batch is stored a
 * few transactions at a time. A file that cannot be used is marked rejected by the service
 * (that is not a job failure); only infrastructure errors throw, and pg-boss retries the
 * batch — files already done are left alone on the second run.
 */
export async function fitUploadFiles(jobs: PgBoss.Job<FitUploadFileJob>[]): Promise<void> {
  await ingestStoredFiles(jobs.map((job) => job.data.uploadFileId));
}

import { sql } from 'drizzle-orm';
import { getDb } from '~/db/client';
import { QUEUES } from './boss';

export interface FitRetry {
  /** The attempt under way or next (2 for the first retry). */
  attempt: number;
  attempts: number;
  /** When the next attempt may start; null while one is running. */
  next_at: string | null;
}

/**
 * Queued files whose fitting job failed at least once (an error, or a worker that died) and
 * is being tried again, by upload-file id. Files on their first attempt are not listed.
 */
export async function fitRetries(uploadFileIds: number[]): Promise<Map<number, FitRetry>> {
  const out = new Map<number, FitRetry>();
  if (uploadFileIds.length === 0) return out;
  const result = await getDb().execute(sql`
    select (data->>'uploadFileId')::int as id, state::text as state, retry_count, retry_limit, start_after
    from pgboss.job
    where name = ${QUEUES.fitUploadFile} and state in ('retry', 'active')
      and (data->>'uploadFileId')::int = any(${`{${uploadFileIds.join(',')}}`}::int[])`);
  for (const r of result.rows as { id: number; state: string; retry_count: number; retry_limit: number; start_after: Date | string }[]) {
    const retrying = r.state === 'retry' || r.retry_count > 0;
    if (!retrying) continue;
    out.set(r.id, {
      attempt: r.state === 'retry' ? r.retry_count + 2 : r.retry_count + 1,
      attempts: r.retry_limit + 1,
      next_at: r.state === 'retry' ? new Date(r.start_after).toISOString() : null,
    });
  }
  return out;
}

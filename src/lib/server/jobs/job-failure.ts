import { AppError } from '~/core/errors';
import { storableText } from '~/core/text/storable-text';
import { describeFailure } from '../failure-text';

/**
 * The error a job handler throws to pg-boss. pg-boss stores a failed job's error as jsonb
 * (message, stack, cause and every own property) without awaiting the write; an error holding
 * text PostgreSQL cannot store (a NUL byte quoted from a file) made that write fail and, with
 * nothing to catch it, ended the worker. This copy carries only storable text: the message
 * (with the cause's, when it adds something), capped, and a stack of the same.
 */
export class JobFailure extends AppError<'job_failed'> {
  constructor(queue: string, error: unknown) {
    super('job_failed', { queue, reason: describe(error) });
    this.message = storableText(this.message);
    this.name = 'JobFailure';
    const stack = error instanceof Error ? error.stack : undefined;
    this.stack = stack ? storableText(stack, 4000) : undefined;
  }
}

function describe(error: unknown): string {
  const message = describeFailure(error, 1500);
  const cause = error instanceof Error ? (error as { cause?: unknown }).cause : undefined;
  if (cause === undefined) return message;
  const causeMessage = describeFailure(cause, 400);
  return message.includes(causeMessage) ? message : `${message} (cause: ${causeMessage})`;
}

/**
 * Wraps a job handler so that whatever it throws reaches pg-boss as a `JobFailure`: the
 * failure is recorded and the job retried; the worker goes on.
 */
export function guardJobHandler<J>(queue: string, handler: (jobs: J[]) => Promise<void>): (jobs: J[]) => Promise<void> {
  return async (jobs) => {
    try {
      await handler(jobs);
    } catch (err) {
      const failure = err instanceof JobFailure ? err : new JobFailure(queue, err);
      console.error(`[jobs] ${jobs.length} job(s) of ${queue} failed; pg-boss retries them: ${failure.message}`);
      throw failure;
    }
  };
}

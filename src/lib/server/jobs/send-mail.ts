import type PgBoss from 'pg-boss';
import { deliverMail, type OutgoingMail } from '../mail';

/** Works queued mail one message at a time; a refusal throws, and pg-boss tries again later. */
export async function sendQueuedMail(jobs: PgBoss.Job<OutgoingMail>[]): Promise<void> {
  for (const job of jobs) {
    await deliverMail(job.data);
    console.log(`[mail] queued message "${job.data.subject}" sent`);
  }
}

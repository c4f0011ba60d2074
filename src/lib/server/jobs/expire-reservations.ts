import type PgBoss from 'pg-boss';
import { expireDueReservations } from '../services/reservations/expire';
import { QUEUES } from './boss';
import { guardJobHandler } from './job-failure';

/** Every five minutes: active reservations past their expiry, not yet being picked, go back to stock. */
export const EXPIRE_RESERVATIONS_CRON = '*/5 * * * *';

/** Schedules the periodic expiry and works its queue; returns the queue name. */
export async function registerExpireReservations(boss: PgBoss): Promise<string> {
  await boss.work(
    QUEUES.expireReservations,
    guardJobHandler(QUEUES.expireReservations, async () => {
      const expired = await expireDueReservations();
      if (expired.length) console.log(`[jobs] expired ${expired.length} reservation(s)`);
    }),
  );
  await boss.schedule(QUEUES.expireReservations, EXPIRE_RESERVATIONS_CRON);
  return QUEUES.expireReservations;
}

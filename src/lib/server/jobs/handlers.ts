import type PgBoss from 'pg-boss';

/** Registers every queue's handler on `boss`; returns the queue names being worked. */
export async function registerJobHandlers(boss: PgBoss): Promise<string[]> {
  void boss;
  return [];
}

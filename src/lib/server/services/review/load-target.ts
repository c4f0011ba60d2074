import { eq } from 'drizzle-orm';
import { schema, type DbOrTx } from '~/db/client';
import { AppError } from '~/lib/server/errors';

/** Locks the part under review and loads its current fit, sweep and type. */
export async function loadReviewTarget(tx: DbOrTx, serial: string, fitId: number | undefined) {
  const [row] = await tx
    .select({ part: schema.part, type: schema.deviceType })
    .from(schema.part)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .where(eq(schema.part.serial, serial))
    .for('update', { of: schema.part });
  if (!row) throw new AppError('not_found', `No part with serial ${serial}.`);
  if (row.part.currentFitId === null) throw new AppError('conflict', `Part ${serial} has no fit to review.`);
  if (fitId !== undefined && fitId !== row.part.currentFitId) {
    throw new AppError('conflict', `Part ${serial} has a newer fit (${row.part.currentFitId}) than the one you reviewed (${fitId}); reload the page and look again.`);
  }
  const [fit] = await tx.select().from(schema.fit).where(eq(schema.fit.id, row.part.currentFitId));
  const [sweep] = await tx.select().from(schema.sweep).where(eq(schema.sweep.id, fit.sweepId));
  return { ...row, fit, sweep };
}

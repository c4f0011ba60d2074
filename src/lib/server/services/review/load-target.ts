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
  if (!row) throw new AppError('part_not_found', { serial });
  if (row.part.currentFitId === null) throw new AppError('part_has_no_fit_to_review', { serial });
  if (fitId !== undefined && fitId !== row.part.currentFitId) {
    throw new AppError('fit_superseded', { serial, currentFitId: row.part.currentFitId, reviewedFitId: fitId });
  }
  const [fit] = await tx.select().from(schema.fit).where(eq(schema.fit.id, row.part.currentFitId));
  const [sweep] = await tx.select().from(schema.sweep).where(eq(schema.sweep.id, fit.sweepId));
  return { ...row, fit, sweep };
}

import { eq } from 'drizzle-orm';
import { AcceptFitsRequest, ReviewTarget, type FitAccepted, type FitsAccepted } from '~/contracts/review';
import { getDb, schema, type DbOrTx } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { assignBinsForParts } from '../bins/assign-bins';
import { changePartStatuses } from '../parts/change-status';
import { loadReviewTarget } from './load-target';

async function acceptOne(tx: DbOrTx, actor: Actor, serial: string, fitId: number | undefined, note: string | undefined): Promise<FitAccepted> {
  const { part, fit } = await loadReviewTarget(tx, serial, fitId);
  await tx
    .update(schema.fit)
    .set({ review: 'accepted', reviewedBy: actor.userId, reviewedAt: new Date(), reviewNote: note ?? null })
    .where(eq(schema.fit.id, fit.id));
  await writeAudit(tx, actor, { action: 'fit.accept', subjectType: 'part', subjectId: part.serial, before: { fit_id: fit.id, review: fit.review }, after: { review: 'accepted' }, reason: note });
  await changePartStatuses(tx, actor, [{ partId: part.id, to: 'accepted' }], { action: 'part.review_accept', reason: note ?? `fit ${fit.id} accepted on review` });
  await assignBinsForParts(tx, actor, [part.id]);
  const [after] = await tx.select({ status: schema.part.status, binId: schema.part.binId }).from(schema.part).where(eq(schema.part.id, part.id));
  return { serial: part.serial, status: after.status, fit_id: fit.id, bin_id: after.binId };
}

/** An inspector accepts the part's current fit despite its flags: the part is accepted and binned. */
export async function acceptFit({ actor, input }: { actor: Actor | null; input: unknown }): Promise<FitAccepted> {
  requirePermission(actor, 'fits:review');
  const data = ReviewTarget.parse(input);
  return getDb().transaction((tx) => acceptOne(tx, actor, data.serial, data.fit_id, data.note));
}

/**
 * Accepts several parts' fits at once, in ONE transaction: all are accepted and binned, or
 * none (the error names the part that stopped the batch).
 */
export async function acceptFits({ actor, input }: { actor: Actor | null; input: unknown }): Promise<FitsAccepted> {
  requirePermission(actor, 'fits:review');
  const data = AcceptFitsRequest.parse(input);
  const serials = data.parts.map((p) => p.serial);
  if (new Set(serials).size !== serials.length) throw new AppError('part_listed_twice');
  return getDb().transaction(async (tx) => {
    const accepted = [];
    // Serial order, so two batches over the same parts lock them in the same order.
    for (const p of [...data.parts].sort((a, b) => a.serial.localeCompare(b.serial))) accepted.push(await acceptOne(tx, actor, p.serial, p.fit_id, data.note));
    return { accepted };
  });
}

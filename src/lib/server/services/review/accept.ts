import { eq } from 'drizzle-orm';
import { getDb, schema } from '../../../../db/client';
import { writeAudit } from '../../audit';
import { requirePermission, type Actor } from '../../identity';
import { assignBinsForParts } from '../bins/assign-bins';
import { changePartStatuses } from '../parts/change-status';
import { loadReviewTarget } from './load-target';
import { ReviewTarget } from './schemas';

/** An inspector accepts the part's current fit despite its flags: the part is accepted and binned. */
export async function acceptFit({ actor, input }: { actor: Actor | null; input: unknown }) {
  requirePermission(actor, 'fits:review');
  const data = ReviewTarget.parse(input);
  return getDb().transaction(async (tx) => {
    const { part, fit } = await loadReviewTarget(tx, data.serial, data.fit_id);
    await tx
      .update(schema.fit)
      .set({ review: 'accepted', reviewedBy: actor.userId, reviewedAt: new Date(), reviewNote: data.note ?? null })
      .where(eq(schema.fit.id, fit.id));
    await writeAudit(tx, actor, { action: 'fit.accept', subjectType: 'part', subjectId: part.serial, before: { fit_id: fit.id, review: fit.review }, after: { review: 'accepted' }, reason: data.note });
    await changePartStatuses(tx, actor, [{ partId: part.id, to: 'accepted' }], { action: 'part.review_accept', reason: data.note ?? `fit ${fit.id} accepted on review` });
    await assignBinsForParts(tx, actor, [part.id]);
    const [after] = await tx.select({ status: schema.part.status, binId: schema.part.binId }).from(schema.part).where(eq(schema.part.id, part.id));
    return { serial: part.serial, status: after.status, fit_id: fit.id, bin_id: after.binId };
  });
}

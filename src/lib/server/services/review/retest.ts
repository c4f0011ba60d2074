import { eq } from 'drizzle-orm';
import { ReviewTarget, type RetestResult } from '~/contracts/review';
import { getDb, schema } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { changePartStatuses } from '../parts/change-status';
import { partChangeMails, sendPartChangeMails } from '../reservations/mail-part-change';
import { loadReviewTarget } from './load-target';

/** Sends the part back to be measured again; its next sweep takes it out of `retest`. */
export async function markForRetest({ actor, input }: { actor: Actor | null; input: unknown }): Promise<RetestResult> {
  requirePermission(actor, 'fits:review');
  const data = ReviewTarget.parse(input);
  const { out, mails } = await getDb().transaction(async (tx) => {
    const { part, fit } = await loadReviewTarget(tx, data.serial, data.fit_id);
    await tx
      .update(schema.fit)
      .set({ review: 'retest', reviewedBy: actor.userId, reviewedAt: new Date(), reviewNote: data.note ?? null })
      .where(eq(schema.fit.id, fit.id));
    await writeAudit(tx, actor, { action: 'fit.retest', subjectType: 'part', subjectId: part.serial, before: { fit_id: fit.id, review: fit.review }, after: { review: 'retest' }, reason: data.note });
    await changePartStatuses(tx, actor, [{ partId: part.id, to: 'retest' }], { action: 'part.review_retest', reason: data.note ?? 'marked for retest on review' });
    const mails = await partChangeMails(tx, [part.id], { what: 'marked for retest', by: actor.label, reason: data.note ?? null });
    return { out: { serial: part.serial, status: 'retest' as const, fit_id: fit.id }, mails };
  });
  await sendPartChangeMails(mails);
  return out;
}

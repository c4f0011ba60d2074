import { eq } from 'drizzle-orm';
import { fitCurveFamily } from '~/core/fit/fit-curve-family';
import { RefitInput, type RefitResult } from '~/contracts/review';
import { getDb, schema } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { fitColumns } from '../fits/fit-columns';
import { changePartStatuses } from '../parts/change-status';
import { partChangeMails, sendPartChangeMails } from '../reservations/mail-part-change';
import { toCurveFamily, toFlatIndices, type StoredCurve } from '../sweeps/stored-curves';
import { loadReviewTarget } from './load-target';

/**
 * Refits the current sweep with the points the inspector left out. The excluded points are
 * kept on the sweep and the new fit becomes the part's current one; the part stays in the
 * review queue until someone accepts it (or marks it for retest).
 */
export async function refitWithExclusions({ actor, input }: { actor: Actor | null; input: unknown }): Promise<RefitResult> {
  requirePermission(actor, 'fits:review');
  const data = RefitInput.parse(input);
  const { out, mails } = await getDb().transaction(async (tx) => {
    const { part, type, fit, sweep } = await loadReviewTarget(tx, data.serial, data.fit_id);
    const curves = sweep.curves as StoredCurve[];
    const unique = [...new Map(data.excluded_points.map((p) => [`${p[0]}:${p[1]}`, p] as const)).values()];
    const flat = toFlatIndices(curves, unique);
    const result = fitCurveFamily(toCurveFamily(curves), {
      vdsTestV: type.vdsTestV,
      excludedPoints: flat,
      ...(sweep.temperatureC !== null ? { temperatureC: sweep.temperatureC } : {}),
    });
    if (result.status !== 'fitted') {
      throw new AppError('refit_not_possible', { left: unique.length, flags: result.flags.map((f) => f.message) });
    }
    await tx.update(schema.sweep).set({ excludedPoints: unique }).where(eq(schema.sweep.id, sweep.id));
    const [created] = await tx
      .insert(schema.fit)
      .values(fitColumns(result, type.channel, { sweepId: sweep.id, partId: part.id }, 'needs_review'))
      .returning();
    await tx.update(schema.part).set({ currentFitId: created.id, updatedAt: new Date() }).where(eq(schema.part.id, part.id));
    await writeAudit(tx, actor, {
      action: 'fit.refit',
      subjectType: 'part',
      subjectId: part.serial,
      before: { fit_id: fit.id, excluded_points: sweep.excludedPoints },
      after: { fit_id: created.id, excluded_points: unique, flags: created.flags },
      reason: data.note,
    });
    if (part.status !== 'needs_review') {
      await changePartStatuses(tx, actor, [{ partId: part.id, to: 'needs_review' }], { action: 'part.refit', reason: 'refitted on review' });
    }
    const mails = await partChangeMails(tx, [part.id], { what: 'refitted', by: actor.label, reason: data.note ?? null });
    return { out: { serial: part.serial, fit_id: created.id, flags: created.flags, rms_rel: created.rmsRel, idss_a: created.idssA, vp_v: created.vpV }, mails };
  });
  await sendPartChangeMails(mails);
  return out;
}

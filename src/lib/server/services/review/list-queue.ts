import { and, asc, eq, ne, sql, type SQL } from 'drizzle-orm';
import { z } from 'zod';
import type { FitResult } from '~/core/fit/definitions';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';

export const ReviewQueueInput = z.object({
  /**
   * `model_disagrees` lists parts whose fitted model puts VGS away from the measured one (an
   * advisory flag: the parts are not held, this list only informs).
   */
  status: z.enum(['needs_review', 'retest', 'model_disagrees']).default('needs_review'),
  limit: z.coerce.number().int().min(1).max(500).default(200),
});

/** Parts waiting for a person, oldest fit first, with their flags in plain words. */
export async function listReviewQueue({ actor, input }: { actor: Actor | null; input: unknown }) {
  requirePermission(actor, 'fits:review');
  const f = ReviewQueueInput.parse(input ?? {});
  const db = getDb();
  const which: SQL =
    f.status === 'model_disagrees'
      ? and(sql`'model_disagrees' = ANY(${schema.fit.flags})`, ne(schema.part.status, 'scrapped'))!
      : eq(schema.part.status, f.status);
  const rows = await db
    .select({ part: schema.part, type: schema.deviceType, lot: schema.lot, fit: schema.fit, fileName: schema.uploadFile.originalName })
    .from(schema.part)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .leftJoin(schema.lot, eq(schema.lot.id, schema.part.lotId))
    .leftJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
    .leftJoin(schema.sweep, eq(schema.sweep.id, schema.fit.sweepId))
    .leftJoin(schema.uploadFile, eq(schema.uploadFile.id, schema.sweep.uploadFileId))
    .where(which)
    .orderBy(asc(schema.fit.createdAt), asc(schema.part.serial))
    .limit(f.limit);
  const [{ total }] = await db
    .select({ total: sql<number>`count(*)::int` })
    .from(schema.part)
    .leftJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
    .where(which);
  return {
    status: f.status,
    total,
    items: rows.map(({ part, type, lot, fit, fileName }) => ({
      serial: part.serial,
      device_type: type.name,
      channel: type.channel,
      lot: lot?.code ?? null,
      fit_id: fit?.id ?? null,
      fitted_at: fit?.createdAt.toISOString() ?? null,
      file_name: fileName,
      idss_a: fit?.idssA ?? null,
      vp_v: fit?.vpV ?? null,
      rms_rel: fit && Number.isFinite(fit.rmsRel) ? fit.rmsRel : null,
      flags: fit ? ((fit.detail as FitResult).flags ?? []).map((x) => ({ code: x.code, message: x.message })) : [],
      review_note: fit?.reviewNote ?? null,
    })),
  };
}

import { and, asc, eq, ne, sql, type SQL } from 'drizzle-orm';
import type { FitResult } from '~/core/fit/definitions';
import { ReviewQueueQuery, type ReviewQueue } from '~/contracts/review';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';

/** Parts waiting for a person, oldest fit first, with their flags in plain words. */
export async function listReviewQueue({ actor, input }: { actor: Actor | null; input: unknown }): Promise<ReviewQueue> {
  requirePermission(actor, 'fits:review');
  const f = ReviewQueueQuery.parse(input ?? {});
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

import { and, asc, count, eq, ilike, type SQL } from 'drizzle-orm';
import { ListPartsQuery, type PartsPage } from '~/contracts/parts';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { partJson } from './part-json';

function escapeLike(s: string): string {
  return s.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/** Parts with their current figures, filtered and paged on the server, ordered by serial. */
export async function listParts({ actor, input }: { actor: Actor | null; input: unknown }): Promise<PartsPage> {
  requirePermission(actor, 'parts:read');
  const f = ListPartsQuery.parse(input);
  const where: SQL[] = [];
  if (f.status) where.push(eq(schema.part.status, f.status));
  if (f.device_type) where.push(eq(schema.deviceType.name, f.device_type));
  if (f.lot) where.push(eq(schema.lot.code, f.lot));
  if (f.bin) where.push(eq(schema.bin.code, f.bin));
  if (f.q) where.push(ilike(schema.part.serial, `%${escapeLike(f.q)}%`));
  const cond = where.length ? and(...where) : undefined;
  const db = getDb();

  const base = () =>
    db
      .select({ part: schema.part, type: schema.deviceType, lot: schema.lot, bin: schema.bin, location: schema.location, fit: schema.fit })
      .from(schema.part)
      .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
      .leftJoin(schema.lot, eq(schema.lot.id, schema.part.lotId))
      .leftJoin(schema.bin, eq(schema.bin.id, schema.part.binId))
      .leftJoin(schema.location, eq(schema.location.id, schema.part.locationId))
      .leftJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId));
  const [{ total }] = await db
    .select({ total: count() })
    .from(schema.part)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .leftJoin(schema.lot, eq(schema.lot.id, schema.part.lotId))
    .leftJoin(schema.bin, eq(schema.bin.id, schema.part.binId))
    .where(cond);
  const rows = await base()
    .where(cond)
    .orderBy(asc(schema.part.serial))
    .limit(f.page_size)
    .offset((f.page - 1) * f.page_size);

  return {
    page: f.page,
    page_size: f.page_size,
    total,
    page_count: Math.max(1, Math.ceil(total / f.page_size)),
    parts: rows.map(({ fit, ...row }) => ({
      ...partJson(row),
      vto_v: fit?.vtoV ?? null,
      beta_a_per_v2: fit?.betaAPerV2 ?? null,
      lambda_per_v: fit?.lambdaPerV ?? null,
      idss_a: fit?.idssA ?? null,
      idss_vds_v: fit?.idssVdsV ?? null,
      vp_v: fit?.vpV ?? null,
      gfs_s: fit?.gfsS ?? null,
      gos_s: fit?.gosS ?? null,
      rms_rel: fit && Number.isFinite(fit.rmsRel) ? fit.rmsRel : null,
      flags: fit?.flags ?? [],
      fitted_at: fit?.createdAt.toISOString() ?? null,
    })),
  };
}

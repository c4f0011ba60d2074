import { and, asc, count, eq, ilike, inArray, type SQL } from 'drizzle-orm';
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
  const db = getDb();
  // Filters on the part's own columns (names and codes become id lookups), so the count and
  // the page's ids come from the part table and its indexes alone.
  const where: SQL[] = [];
  if (f.status) where.push(eq(schema.part.status, f.status));
  if (f.device_type) {
    // Resolved first: a plain id lets the planner walk the (type, serial) index in order.
    const [type] = await db.select({ id: schema.deviceType.id }).from(schema.deviceType).where(eq(schema.deviceType.name, f.device_type));
    where.push(eq(schema.part.deviceTypeId, type?.id ?? -1));
  }
  if (f.lot) where.push(inArray(schema.part.lotId, db.select({ id: schema.lot.id }).from(schema.lot).where(eq(schema.lot.code, f.lot))));
  if (f.bin) where.push(inArray(schema.part.binId, db.select({ id: schema.bin.id }).from(schema.bin).where(eq(schema.bin.code, f.bin))));
  if (f.q) where.push(ilike(schema.part.serial, `%${escapeLike(f.q)}%`));
  const cond = where.length ? and(...where) : undefined;

  const [{ total }] = await db.select({ total: count() }).from(schema.part).where(cond);
  // The page's parts first (narrow rows, in serial order), then their figures and names.
  const pageIds = db
    .select({ id: schema.part.id })
    .from(schema.part)
    .where(cond)
    .orderBy(asc(schema.part.serial))
    .limit(f.page_size)
    .offset((f.page - 1) * f.page_size);
  const fit = schema.fit;
  const rows = await db
    .select({
      part: schema.part,
      type: schema.deviceType,
      lot: schema.lot,
      bin: schema.bin,
      location: schema.location,
      fit: {
        vtoV: fit.vtoV,
        betaAPerV2: fit.betaAPerV2,
        lambdaPerV: fit.lambdaPerV,
        idssA: fit.idssA,
        idssVdsV: fit.idssVdsV,
        vpV: fit.vpV,
        gfsS: fit.gfsS,
        gosS: fit.gosS,
        rmsRel: fit.rmsRel,
        flags: fit.flags,
        createdAt: fit.createdAt,
      },
    })
    .from(schema.part)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .leftJoin(schema.lot, eq(schema.lot.id, schema.part.lotId))
    .leftJoin(schema.bin, eq(schema.bin.id, schema.part.binId))
    .leftJoin(schema.location, eq(schema.location.id, schema.part.locationId))
    .leftJoin(fit, eq(fit.id, schema.part.currentFitId))
    .where(inArray(schema.part.id, pageIds))
    .orderBy(asc(schema.part.serial));

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

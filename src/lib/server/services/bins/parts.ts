import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { BinPartsQuery, type BinPartsPage } from '~/contracts/bins';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { partJson } from '../parts/part-json';
import { loadBin } from './get';

/** Parts sitting in one bin, with their figures and where they are; for the bin map's list. */
export async function listPartsInBin({ actor, binId, query }: { actor: Actor | null; binId: number; query: unknown }): Promise<BinPartsPage> {
  requirePermission(actor, 'stock:read');
  const q = BinPartsQuery.parse(query);
  const db = getDb();
  const bin = await loadBin(db, binId);
  const where = [eq(schema.part.binId, binId)];
  if (q.status.length) where.push(inArray(schema.part.status, q.status));
  const rows = await db
    .select({
      part: { serial: schema.part.serial, status: schema.part.status },
      type: { name: schema.deviceType.name, channel: schema.deviceType.channel },
      idssA: schema.fit.idssA,
      vpV: schema.fit.vpV,
      gfsS: schema.fit.gfsS,
      lotCode: schema.lot.code,
      locationName: schema.location.name,
      total: sql<number>`count(*) over ()::int`,
    })
    .from(schema.part)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .leftJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
    .leftJoin(schema.lot, eq(schema.lot.id, schema.part.lotId))
    .leftJoin(schema.location, eq(schema.location.id, schema.part.locationId))
    .where(and(...where))
    .orderBy(asc(schema.part.serial))
    .limit(q.page_size)
    .offset((q.page - 1) * q.page_size);
  return {
    bin,
    parts: rows.map((r) => ({
      ...partJson({
        part: r.part,
        type: r.type,
        lot: r.lotCode === null ? null : { code: r.lotCode },
        bin,
        location: r.locationName === null ? null : { name: r.locationName },
      }),
      idss_a: r.idssA,
      vp_v: r.vpV,
      gfs_s: r.gfsS,
    })),
    total: rows[0]?.total ?? 0,
    page: q.page,
    page_size: q.page_size,
  };
}

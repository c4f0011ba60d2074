import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { PART_STATUSES, type PartStatus } from '~/core/stock/part-transitions';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { z } from 'zod';
import { loadBin } from './get';

const Query = z.object({
  status: z
    .string()
    .optional()
    .transform((s) => (s ? s.split(',').filter(Boolean) : []))
    .pipe(z.array(z.enum(PART_STATUSES))),
  page: z.coerce.number().int().min(1).default(1),
  page_size: z.coerce.number().int().min(1).max(500).default(100),
});

/** Parts sitting in one bin, with their figures and where they are; for the bin map's list. */
export async function listPartsInBin({ actor, binId, query }: { actor: Actor | null; binId: number; query: unknown }) {
  requirePermission(actor, 'stock:read');
  const q = Query.parse(query);
  const db = getDb();
  const bin = await loadBin(db, binId);
  const where = [eq(schema.part.binId, binId)];
  if (q.status.length) where.push(inArray(schema.part.status, q.status as PartStatus[]));
  const rows = await db
    .select({
      serial: schema.part.serial,
      status: schema.part.status,
      idssA: schema.fit.idssA,
      vpV: schema.fit.vpV,
      gfsS: schema.fit.gfsS,
      lot: schema.lot.code,
      location: schema.location.name,
      total: sql<number>`count(*) over ()::int`,
    })
    .from(schema.part)
    .leftJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
    .leftJoin(schema.lot, eq(schema.lot.id, schema.part.lotId))
    .leftJoin(schema.location, eq(schema.location.id, schema.part.locationId))
    .where(and(...where))
    .orderBy(asc(schema.part.serial))
    .limit(q.page_size)
    .offset((q.page - 1) * q.page_size);
  return {
    bin,
    parts: rows.map((r) => ({ serial: r.serial, status: r.status, idss_a: r.idssA, vp_v: r.vpV, gfs_s: r.gfsS, lot: r.lot, location: r.location })),
    total: rows[0]?.total ?? 0,
    page: q.page,
    page_size: q.page_size,
  };
}

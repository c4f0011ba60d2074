import { asc, sql } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import type { LocationJson } from '~/contracts/locations';

/** Every location with how many active-plan bins call it home and how many parts sit there. */
export async function listLocations({ actor }: { actor: Actor | null }): Promise<LocationJson[]> {
  requirePermission(actor, 'stock:read');
  // Written out: in a one-table select Drizzle leaves columns unqualified, which the subqueries would capture.
  const rows = await getDb()
    .select({
      id: schema.location.id,
      name: schema.location.name,
      barcode: schema.location.barcode,
      description: schema.location.description,
      binCount: sql<number>`(select count(*)::int from ${schema.bin} b join ${schema.binPlan} bp on bp.id = b.bin_plan_id and bp.is_active where b.home_location_id = "location"."id")`,
      partCount: sql<number>`(select count(*)::int from ${schema.part} p where p.location_id = "location"."id" and p.status in ('in_stock', 'reserved'))`,
    })
    .from(schema.location)
    .orderBy(asc(schema.location.name));
  return rows.map((r) => ({ id: r.id, name: r.name, barcode: r.barcode, description: r.description, bin_count: r.binCount, part_count: r.partCount }));
}

import { asc, count, desc, eq } from 'drizzle-orm';
import type { StatisticsOptions } from '~/contracts/statistics';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';


/** What the statistics page offers to choose from: device types and lots, newest lots first. */
export async function listStatisticsOptions({ actor }: { actor: Actor | null }): Promise<StatisticsOptions> {
  requirePermission(actor, 'statistics:read');
  const db = getDb();
  const types = await db
    .select({ id: schema.deviceType.id, name: schema.deviceType.name, channel: schema.deviceType.channel })
    .from(schema.deviceType)
    .orderBy(asc(schema.deviceType.name));
  const lots = await db
    .select({
      id: schema.lot.id,
      code: schema.lot.code,
      deviceType: schema.deviceType.name,
      supplier: schema.lot.supplier,
      receivedAt: schema.lot.receivedAt,
      partCount: count(schema.part.id),
    })
    .from(schema.lot)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.lot.deviceTypeId))
    .leftJoin(schema.part, eq(schema.part.lotId, schema.lot.id))
    .groupBy(schema.lot.id, schema.deviceType.name)
    .orderBy(desc(schema.lot.receivedAt), asc(schema.lot.code))
    .limit(500);
  return {
    device_types: types,
    lots: lots.map((l) => ({
      id: l.id,
      code: l.code,
      device_type: l.deviceType,
      supplier: l.supplier,
      received_at: l.receivedAt.toISOString(),
      part_count: Number(l.partCount),
    })),
  };
}

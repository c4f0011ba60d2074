import { desc, eq, sql } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import type { LotJson } from '~/contracts/lots';

export async function listLots({ actor }: { actor: Actor | null }): Promise<LotJson[]> {
  requirePermission(actor, 'lots:read');
  const db = getDb();
  const lots = await db
    .select({ lot: schema.lot, typeName: schema.deviceType.name, channel: schema.deviceType.channel })
    .from(schema.lot)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.lot.deviceTypeId))
    .orderBy(desc(schema.lot.receivedAt), desc(schema.lot.id));
  const counts = await db
    .select({ lotId: schema.part.lotId, status: schema.part.status, n: sql<number>`count(*)::int` })
    .from(schema.part)
    .groupBy(schema.part.lotId, schema.part.status);
  const byLot = new Map<number, Record<string, number>>();
  for (const c of counts) {
    if (c.lotId === null) continue;
    const m = byLot.get(c.lotId) ?? {};
    m[c.status] = c.n;
    byLot.set(c.lotId, m);
  }
  return lots.map(({ lot, typeName, channel }) => {
    const by = byLot.get(lot.id) ?? {};
    return {
      id: lot.id,
      code: lot.code,
      device_type: typeName,
      channel,
      supplier: lot.supplier,
      notes: lot.notes,
      received_at: lot.receivedAt.toISOString(),
      part_count: Object.values(by).reduce((a, b) => a + b, 0),
      by_status: by,
    };
  });
}

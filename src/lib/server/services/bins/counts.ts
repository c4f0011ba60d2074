import { inArray, sql } from 'drizzle-orm';
import { countsFromStatusRows, type BinCounts } from '~/core/stock/stock-counts';
import { schema, type DbOrTx } from '~/db/client';

/**
 * On-hand, reserved and issued counts of each bin, computed from the parts' states with one
 * GROUP BY. Bins without parts get zeros. There is no stored counter to drift.
 */
export async function binCountsFor(tx: DbOrTx, binIds: readonly number[]): Promise<Map<number, BinCounts>> {
  const out = new Map<number, BinCounts>(binIds.map((id) => [id, { onHand: 0, reserved: 0, issued: 0 }]));
  if (binIds.length === 0) return out;
  const rows = await tx
    .select({ binId: schema.part.binId, status: schema.part.status, count: sql<number>`count(*)::int` })
    .from(schema.part)
    .where(inArray(schema.part.binId, [...binIds]))
    .groupBy(schema.part.binId, schema.part.status);
  const byBin = new Map<number, { status: string; count: number }[]>();
  for (const r of rows) {
    if (r.binId === null) continue;
    byBin.set(r.binId, [...(byBin.get(r.binId) ?? []), { status: r.status, count: r.count }]);
  }
  for (const [id, list] of byBin) out.set(id, countsFromStatusRows(list));
  return out;
}

/** SQL fragments for the same counts inside a larger query over `bin`. */
export const countSql = {
  onHand: sql<number>`(select count(*)::int from ${schema.part} p where p.bin_id = ${schema.bin.id} and p.status = 'in_stock')`,
  reserved: sql<number>`(select count(*)::int from ${schema.part} p where p.bin_id = ${schema.bin.id} and p.status = 'reserved')`,
  issued: sql<number>`(select count(*)::int from ${schema.part} p where p.bin_id = ${schema.bin.id} and p.status = 'issued')`,
};

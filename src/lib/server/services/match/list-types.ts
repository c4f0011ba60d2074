import { and, asc, eq, sql } from 'drizzle-orm';
import type { MatchableType } from '~/contracts/match';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';

/** Device types a designer can match from, with what is in stock of each. */
export async function listMatchableTypes({ actor }: { actor: Actor | null }): Promise<MatchableType[]> {
  requirePermission(actor, 'match:request');
  const db = getDb();
  const types = await db.select().from(schema.deviceType).orderBy(asc(schema.deviceType.name));
  const counts = await db
    .select({ typeId: schema.part.deviceTypeId, n: sql<number>`count(*)::int` })
    .from(schema.part)
    .where(eq(schema.part.status, 'in_stock'))
    .groupBy(schema.part.deviceTypeId);
  const bins = await db
    .select({
      typeId: schema.binPlan.deviceTypeId,
      code: schema.bin.code,
      label: schema.bin.label,
      n: sql<number>`(SELECT count(*)::int FROM part p WHERE p.bin_id = ${schema.bin.id} AND p.status = 'in_stock')`,
    })
    .from(schema.bin)
    .innerJoin(schema.binPlan, and(eq(schema.binPlan.id, schema.bin.binPlanId), eq(schema.binPlan.isActive, true)))
    .orderBy(asc(schema.bin.code));
  const countOf = new Map(counts.map((c) => [c.typeId, c.n]));
  return types.map((t) => ({
    id: t.id,
    name: t.name,
    channel: t.channel,
    vds_test_v: t.vdsTestV,
    in_stock: countOf.get(t.id) ?? 0,
    bins: bins.filter((b) => b.typeId === t.id).map((b) => ({ code: b.code, label: b.label, in_stock: b.n })),
  }));
}

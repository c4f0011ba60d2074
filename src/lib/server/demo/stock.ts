import { and, eq, inArray, isNull, sql } from 'drizzle-orm';
import type { BinPlan } from '~/core/binning';
import { getDb, schema } from '~/db/client';
import { permissionsOf, type Role } from '~/lib/access';
import type { Actor } from '../identity';
import { activateBinPlan } from '../services/bin-plans/activate';
import { assignBinsForParts } from '../services/bins/assign-bins';
import { receiveParts } from '../services/stock/receive';

/** Invented stores of the demo lab: two cabinets of drawers, a hold tray and a returns shelf. */
export const DEMO_LOCATIONS = [
  ...[1, 2, 3, 4, 5, 6].map((d) => ({ name: `North cabinet · drawer ${d}`, barcode: `LOC-N${String(d).padStart(2, '0')}`, description: 'N-channel stock' })),
  ...[1, 2, 3, 4, 5].map((d) => ({ name: `South cabinet · drawer ${d}`, barcode: `LOC-S${String(d).padStart(2, '0')}`, description: 'P-channel stock' })),
  { name: 'Hold tray', barcode: 'LOC-HOLD', description: 'Parts outside the bin plan, waiting for a decision' },
  { name: 'Returns shelf', barcode: 'LOC-RET', description: 'Parts back from the bench, to be looked at' },
];

/** Demo plans: 1 mA IDSS steps × 0.4 V pinch-off steps, over each type's spec window. */
export const DEMO_PLANS: Record<string, { name: string; definition: BinPlan; drawerPrefix: string; drawers: number }> = {
  'WS-N30': {
    name: 'Starting plan: 1 mA × 0.4 V',
    drawerPrefix: 'LOC-N',
    drawers: 6,
    definition: {
      axes: [
        { quantity: 'idss', edges: { kind: 'uniform', startValue: 2e-3, width: 1e-3, count: 18 } },
        { quantity: 'vp', edges: { kind: 'uniform', startValue: -4.4, width: 0.4, count: 10 } },
      ],
    },
  },
  'WS-P12': {
    name: 'Starting plan: 1 mA × 0.4 V',
    drawerPrefix: 'LOC-S',
    drawers: 5,
    definition: {
      axes: [
        { quantity: 'idss', edges: { kind: 'uniform', startValue: 2e-3, width: 1e-3, count: 13 } },
        { quantity: 'vp', edges: { kind: 'uniform', startValue: 0.4, width: 0.4, count: 10 } },
      ],
    },
  },
};

/** Share of a type's accepted parts left un-received, so stores have work waiting. */
const LEAVE_FOR_STORES = 0.12;

async function demoActor(email: string, roles: Role[]): Promise<Actor | null> {
  const [u] = await getDb().select({ id: schema.user.id }).from(schema.user).where(eq(schema.user.email, email));
  return u ? { userId: u.id, stationId: null, label: email, permissions: permissionsOf(roles) } : null;
}

/**
 * Locations, a bin plan per demo type with home locations and thresholds, and most accepted
 * demo parts received into stock. Safe to run again, and before any demo parts exist.
 */
export async function seedDemoStock(): Promise<{ received: number }> {
  const db = getDb();
  await db.insert(schema.location).values(DEMO_LOCATIONS).onConflictDoNothing();
  const admin = await demoActor('admin@demo.sluice.test', ['admin']);
  const stores = await demoActor('stores@demo.sluice.test', ['stores']);
  if (!admin || !stores) return { received: 0 };
  const locations = await db.select().from(schema.location);
  const byBarcode = new Map(locations.map((l) => [l.barcode, l.id]));
  let received = 0;

  for (const [typeName, demo] of Object.entries(DEMO_PLANS)) {
    const [type] = await db.select().from(schema.deviceType).where(eq(schema.deviceType.name, typeName));
    if (!type) continue;
    let [plan] = await db.select().from(schema.binPlan).where(and(eq(schema.binPlan.deviceTypeId, type.id), eq(schema.binPlan.isActive, true)));
    if (!plan) {
      await activateBinPlan({ actor: admin, input: { device_type: type.id, name: demo.name, definition: demo.definition } });
      [plan] = await db.select().from(schema.binPlan).where(and(eq(schema.binPlan.deviceTypeId, type.id), eq(schema.binPlan.isActive, true)));
      // Home locations: IDSS columns spread over the cabinet's drawers; hold bin on the tray.
      const bins = await db.select().from(schema.bin).where(eq(schema.bin.binPlanId, plan.id));
      const idssCount = (demo.definition.axes[0].edges as { count: number }).count;
      for (const b of bins) {
        const col = b.isHold ? -1 : Number(b.code.slice(1, 3)) - 1;
        const barcode = b.isHold ? 'LOC-HOLD' : `${demo.drawerPrefix}${String(Math.min(demo.drawers, Math.floor((col * demo.drawers) / idssCount) + 1)).padStart(2, '0')}`;
        await db.update(schema.bin).set({ homeLocationId: byBarcode.get(barcode) ?? null }).where(eq(schema.bin.id, b.id));
      }
    }
    // Parts accepted after the plan (or before it, on an earlier run) but never binned.
    const unbinned = await db
      .select({ id: schema.part.id })
      .from(schema.part)
      .where(and(eq(schema.part.deviceTypeId, type.id), eq(schema.part.status, 'accepted'), isNull(schema.part.binId)));
    if (unbinned.length) await db.transaction((tx) => assignBinsForParts(tx, admin, unbinned.map((p) => p.id)));

    const [{ shelved }] = await db
      .select({ shelved: sql<number>`count(*)::int` })
      .from(schema.part)
      .where(and(eq(schema.part.deviceTypeId, type.id), inArray(schema.part.status, ['in_stock', 'reserved', 'issued'])));
    if (shelved > 0) continue;
    const accepted = await db
      .select({ serial: schema.part.serial })
      .from(schema.part)
      .innerJoin(schema.bin, eq(schema.bin.id, schema.part.binId))
      .where(and(eq(schema.part.deviceTypeId, type.id), eq(schema.part.status, 'accepted'), eq(schema.bin.binPlanId, plan.id)))
      .orderBy(schema.part.id);
    const take = accepted.slice(0, Math.floor(accepted.length * (1 - LEAVE_FOR_STORES)));
    for (let i = 0; i < take.length; i += 200) {
      const r = await receiveParts({ actor: stores, input: { serials: take.slice(i, i + 200).map((p) => p.serial), reason: 'demo: first shelving' } });
      received += r.count;
    }
    // Thresholds where the demo has depth: two thirds of what the bin holds, at least 2.
    await db.execute(sql`
      update ${schema.bin} b set low_stock_threshold = greatest(2, floor(c.n * 2 / 3))
      from (select bin_id, count(*)::int n from ${schema.part} where status = 'in_stock' group by bin_id) c
      where c.bin_id = b.id and b.bin_plan_id = ${plan.id} and c.n >= 4 and b.low_stock_threshold = 0`);
  }
  return { received };
}

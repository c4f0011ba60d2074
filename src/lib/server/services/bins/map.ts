import { and, eq, inArray } from 'drizzle-orm';
import type { BinPlan } from '~/core/binning';
import type { BinMapJson } from '~/contracts/bins';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { binJson } from './bin-json';
import { countSql } from './counts';
import { findDeviceType } from './device-type-ref';
import { binColumns } from './list';

/** Statuses drawn on the map: parts that are binned and still ours or out on issue. */
export const MAP_STATUSES = ['accepted', 'in_stock', 'reserved', 'issued', 'returned'] as const;

const POINT_LIMIT = 5000;

/** A device type's active plan, its bins with counts and its binned parts' (IDSS, VP) points. */
export async function getBinMap({ actor, deviceType }: { actor: Actor | null; deviceType: string }): Promise<BinMapJson> {
  requirePermission(actor, 'stock:read');
  const db = getDb();
  const type = await findDeviceType(db, deviceType);
  const [plan] = await db
    .select()
    .from(schema.binPlan)
    .where(and(eq(schema.binPlan.deviceTypeId, type.id), eq(schema.binPlan.isActive, true)));
  const deviceTypeJson = { id: type.id, name: type.name, channel: type.channel, vds_test_v: type.vdsTestV };
  if (!plan) return { device_type: deviceTypeJson, plan: null, bins: [], points: [], points_left_off: 0 };
  const binRows = await db
    .select({ ...binColumns, onHand: countSql.onHand, reserved: countSql.reserved, issued: countSql.issued })
    .from(schema.bin)
    .innerJoin(schema.binPlan, eq(schema.binPlan.id, schema.bin.binPlanId))
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.binPlan.deviceTypeId))
    .leftJoin(schema.location, eq(schema.location.id, schema.bin.homeLocationId))
    .where(eq(schema.bin.binPlanId, plan.id))
    .orderBy(schema.bin.id);
  const bins = binRows.map((r) => binJson(r, { onHand: r.onHand, reserved: r.reserved, issued: r.issued }));
  const points = await db
    .select({ serial: schema.part.serial, idssA: schema.fit.idssA, vpV: schema.fit.vpV, status: schema.part.status, binId: schema.part.binId })
    .from(schema.part)
    .innerJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
    .where(and(eq(schema.part.deviceTypeId, type.id), inArray(schema.part.status, [...MAP_STATUSES])))
    .orderBy(schema.part.id)
    .limit(POINT_LIMIT + 1);
  return {
    device_type: deviceTypeJson,
    plan: { id: plan.id, version: plan.version, name: plan.name, definition: plan.definition as BinPlan },
    bins,
    points: points.slice(0, POINT_LIMIT).map((p) => ({ serial: p.serial, idss_a: p.idssA, vp_v: p.vpV, status: p.status, bin_id: p.binId })),
    points_left_off: Math.max(0, points.length - POINT_LIMIT),
  };
}

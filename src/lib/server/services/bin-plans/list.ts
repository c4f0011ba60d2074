import { asc, desc, eq, sql } from 'drizzle-orm';
import type { BinPlanDetail, BinPlanJson, BinPlanList } from '~/contracts/bin-plans';
import type { BinPlan } from '~/core/binning';
import { getDb, schema } from '~/db/client';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { findDeviceType } from '../bins/device-type-ref';

const columns = {
  id: schema.binPlan.id,
  deviceType: schema.deviceType.name,
  deviceTypeId: schema.deviceType.id,
  version: schema.binPlan.version,
  name: schema.binPlan.name,
  isActive: schema.binPlan.isActive,
  definition: schema.binPlan.definition,
  createdAt: schema.binPlan.createdAt,
  createdBy: schema.user.email,
  binCount: sql<number>`(select count(*)::int from ${schema.bin} b where b.bin_plan_id = ${schema.binPlan.id})`,
};

type Row = { [K in keyof typeof columns]: unknown } & { createdAt: Date; definition: unknown };

function planJson(r: Row): BinPlanJson {
  return {
    id: r.id as number,
    device_type: r.deviceType as string,
    device_type_id: r.deviceTypeId as number,
    version: r.version as number,
    name: r.name as string,
    is_active: r.isActive as boolean,
    definition: r.definition as BinPlan,
    bin_count: r.binCount as number,
    created_at: r.createdAt.toISOString(),
    created_by: (r.createdBy as string | null) ?? null,
  };
}

/** Every version of every plan (or of one type), newest first within each type. */
export async function listBinPlans({ actor, deviceType }: { actor: Actor | null; deviceType?: string | null }): Promise<BinPlanList> {
  requirePermission(actor, 'binPlans:read');
  const db = getDb();
  const type = deviceType ? await findDeviceType(db, deviceType) : null;
  const rows = await db
    .select(columns)
    .from(schema.binPlan)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.binPlan.deviceTypeId))
    .leftJoin(schema.user, eq(schema.user.id, schema.binPlan.createdBy))
    .where(type ? eq(schema.binPlan.deviceTypeId, type.id) : undefined)
    .orderBy(asc(schema.deviceType.name), desc(schema.binPlan.version));
  const types = await db.select({ id: schema.deviceType.id, name: schema.deviceType.name, channel: schema.deviceType.channel, vdsTestV: schema.deviceType.vdsTestV }).from(schema.deviceType).orderBy(asc(schema.deviceType.name));
  return {
    plans: rows.map(planJson),
    device_types: types.map((t) => ({ id: t.id, name: t.name, channel: t.channel, vds_test_v: t.vdsTestV })),
  };
}

export async function getBinPlan({ actor, id }: { actor: Actor | null; id: number }): Promise<BinPlanDetail> {
  requirePermission(actor, 'binPlans:read');
  const db = getDb();
  const [row] = await db
    .select(columns)
    .from(schema.binPlan)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.binPlan.deviceTypeId))
    .leftJoin(schema.user, eq(schema.user.id, schema.binPlan.createdBy))
    .where(eq(schema.binPlan.id, id));
  if (!row) throw new AppError('bin_plan_not_found', { id });
  const bins = await db
    .select({ id: schema.bin.id, code: schema.bin.code, label: schema.bin.label, isHold: schema.bin.isHold, ranges: schema.bin.ranges, location: schema.location.name, threshold: schema.bin.lowStockThreshold })
    .from(schema.bin)
    .leftJoin(schema.location, eq(schema.location.id, schema.bin.homeLocationId))
    .where(eq(schema.bin.binPlanId, id))
    .orderBy(schema.bin.id);
  return {
    plan: planJson(row),
    bins: bins.map((b) => ({ id: b.id, code: b.code, label: b.label, is_hold: b.isHold, ranges: b.ranges as BinPlanDetail['bins'][number]['ranges'], location: b.location, low_stock_threshold: b.threshold })),
  };
}

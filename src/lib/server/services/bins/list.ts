import { and, asc, desc, eq, ilike, or, sql, type SQL } from 'drizzle-orm';
import { writeCsv } from '~/core/csv/write-csv';
import { getDb, schema, type DbOrTx } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { BinStockQuery, type BinJson, type BinSortKey, type BinStockPage } from '~/contracts/bins';
import { binJson } from './bin-json';
import { countSql } from './counts';
import { findDeviceType } from './device-type-ref';

export const binColumns = {
  id: schema.bin.id,
  code: schema.bin.code,
  label: schema.bin.label,
  isHold: schema.bin.isHold,
  ranges: schema.bin.ranges,
  lowStockThreshold: schema.bin.lowStockThreshold,
  lowStockAlertedAt: schema.bin.lowStockAlertedAt,
  planId: schema.binPlan.id,
  planVersion: schema.binPlan.version,
  deviceTypeId: schema.deviceType.id,
  deviceTypeName: schema.deviceType.name,
  locationId: schema.location.id,
  locationName: schema.location.name,
  locationBarcode: schema.location.barcode,
};

/** Bins of the active plans (one type or all) joined to their type and home location. */
export function selectActiveBins(tx: DbOrTx) {
  return tx
    .select({ ...binColumns, onHand: countSql.onHand, reserved: countSql.reserved, issued: countSql.issued, total: sql<number>`count(*) over ()::int` })
    .from(schema.bin)
    .innerJoin(schema.binPlan, and(eq(schema.binPlan.id, schema.bin.binPlanId), eq(schema.binPlan.isActive, true)))
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.binPlan.deviceTypeId))
    .leftJoin(schema.location, eq(schema.location.id, schema.bin.homeLocationId));
}

const SORT: Record<BinSortKey, SQL | typeof schema.bin.code> = {
  code: sql`${schema.bin.code}`,
  label: sql`${schema.bin.label}`,
  location: sql`${schema.location.name}`,
  on_hand: countSql.onHand,
  reserved: countSql.reserved,
  issued: countSql.issued,
  low_stock_threshold: sql`${schema.bin.lowStockThreshold}`,
  device_type: sql`${schema.deviceType.name}`,
};

/**
 * The bin stock table: bins of the active plans with computed counts, filtered, sorted and
 * paged in SQL. `all: true` drops the paging (CSV export).
 */
export async function listBinStock({ actor, query, all = false }: { actor: Actor | null; query: unknown; all?: boolean }): Promise<BinStockPage> {
  requirePermission(actor, 'stock:read');
  const q = BinStockQuery.parse(query);
  const db = getDb();
  const where: SQL[] = [];
  if (q.device_type) {
    const type = await findDeviceType(db, q.device_type);
    where.push(eq(schema.deviceType.id, type.id));
  }
  if (q.q) {
    const pattern = `%${q.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    where.push(or(ilike(schema.bin.code, pattern), ilike(schema.bin.label, pattern), ilike(schema.location.name, pattern))!);
  }
  if (q.location_id) where.push(eq(schema.bin.homeLocationId, q.location_id));
  if (q.low_only) where.push(sql`${schema.bin.lowStockThreshold} > 0 and ${countSql.onHand} < ${schema.bin.lowStockThreshold}`);
  if (!q.include_empty) where.push(sql`(${countSql.onHand} + ${countSql.reserved} + ${countSql.issued}) > 0`);
  const order = q.dir === 'asc' ? asc : desc;
  // The hold bin sorts after the grid for the default order; codes then break ties.
  let stmt = selectActiveBins(db)
    .where(where.length ? and(...where) : undefined)
    .orderBy(order(SORT[q.sort]), asc(schema.deviceType.name), asc(schema.bin.isHold), asc(schema.bin.code))
    .$dynamic();
  if (!all) stmt = stmt.limit(q.page_size).offset((q.page - 1) * q.page_size);
  const rows = await stmt;
  return {
    bins: rows.map((r) => binJson(r, { onHand: r.onHand, reserved: r.reserved, issued: r.issued })),
    total: rows[0]?.total ?? (q.page > 1 ? await countOnly(db, where) : 0),
    page: q.page,
    page_size: q.page_size,
    sort: q.sort,
    dir: q.dir,
  };
}

async function countOnly(db: DbOrTx, where: SQL[]): Promise<number> {
  const rows = await selectActiveBins(db).where(where.length ? and(...where) : undefined).limit(1);
  return rows[0]?.total ?? 0;
}

const CSV_COLUMNS: [string, (b: BinJson) => string | number | null][] = [
  ['device_type', (b) => b.device_type],
  ['plan_version', (b) => b.plan_version],
  ['code', (b) => b.code],
  ['label', (b) => b.label],
  ['idss_lo_a', (b) => b.idss_lo_a],
  ['idss_hi_a', (b) => b.idss_hi_a],
  ['vp_lo_v', (b) => b.vp_lo_v],
  ['vp_hi_v', (b) => b.vp_hi_v],
  ['vgs_lo_v', (b) => b.vgs_lo_v],
  ['vgs_hi_v', (b) => b.vgs_hi_v],
  ['location', (b) => b.location?.name ?? null],
  ['location_barcode', (b) => b.location?.barcode ?? null],
  ['on_hand', (b) => b.on_hand],
  ['reserved', (b) => b.reserved],
  ['issued', (b) => b.issued],
  ['low_stock_threshold', (b) => b.low_stock_threshold],
];

/** The same rows as the table (all pages), as CSV with a header line (the shared writer). */
export async function binStockCsv({ actor, query }: { actor: Actor | null; query: unknown }): Promise<string> {
  const page = await listBinStock({ actor, query, all: true });
  return writeCsv(
    CSV_COLUMNS.map(([h]) => h),
    page.bins.map((b) => CSV_COLUMNS.map(([, f]) => f(b))),
  );
}

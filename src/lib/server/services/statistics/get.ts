import { and, asc, eq, gte, inArray, lte, type SQL } from 'drizzle-orm';
import { StatisticsQuery, type StatisticsReport } from '~/contracts/statistics';
import { getDb, schema, type DbOrTx } from '~/db/client';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import {
  buildTypeStatistics,
  type BinRangeJson,
  type StatisticsPartRow,
  type StatisticsTypeInfo,
  type TrendLotInfo,
} from '~/core/statistics/type-report';


async function findDeviceType(db: DbOrTx, ref: string) {
  const byName = await db.select().from(schema.deviceType).where(eq(schema.deviceType.name, ref)).limit(1);
  if (byName[0]) return byName[0];
  if (/^\d+$/.test(ref)) {
    const byId = await db.select().from(schema.deviceType).where(eq(schema.deviceType.id, Number(ref))).limit(1);
    if (byId[0]) return byId[0];
  }
  throw new AppError('statistics_type_unknown', { ref }, {
    fields: [{ field: 'device_type', message: `no device type named '${ref}'` }],
  });
}

async function findLot(db: DbOrTx, ref: string) {
  const byCode = await db.select().from(schema.lot).where(eq(schema.lot.code, ref)).limit(1);
  if (byCode[0]) return byCode[0];
  if (/^\d+$/.test(ref)) {
    const byId = await db.select().from(schema.lot).where(eq(schema.lot.id, Number(ref))).limit(1);
    if (byId[0]) return byId[0];
  }
  throw new AppError('statistics_lot_unknown', { ref }, {
    fields: [{ field: 'lot', message: `no lot with code '${ref}'` }],
  });
}

async function loadRows(db: DbOrTx, where: SQL[]): Promise<StatisticsPartRow[]> {
  const rows = await db
    .select({
      serial: schema.part.serial,
      status: schema.part.status,
      deviceTypeId: schema.part.deviceTypeId,
      lotId: schema.part.lotId,
      lotCode: schema.lot.code,
      binCode: schema.bin.code,
      fitId: schema.fit.id,
      idssA: schema.fit.idssA,
      vpV: schema.fit.vpV,
      gosS: schema.fit.gosS,
      gfsS: schema.fit.gfsS,
      idssVdsV: schema.fit.idssVdsV,
      review: schema.fit.review,
    })
    .from(schema.part)
    .leftJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
    .leftJoin(schema.lot, eq(schema.lot.id, schema.part.lotId))
    .leftJoin(schema.bin, eq(schema.bin.id, schema.part.binId))
    .where(where.length ? and(...where) : undefined)
    .orderBy(asc(schema.part.serial));
  return rows.map((r) => ({
    serial: r.serial,
    status: r.status,
    deviceTypeId: r.deviceTypeId,
    lotId: r.lotId,
    lotCode: r.lotCode,
    binCode: r.binCode,
    fit:
      r.fitId === null
        ? null
        : { idssA: r.idssA!, vpV: r.vpV!, gosS: r.gosS!, gfsS: r.gfsS!, idssVdsV: r.idssVdsV!, review: r.review! },
  }));
}

/**
 * Statistics of a lot, a device type and/or a date range (of the current fit or of the lot's
 * receipt), one group per device type.
 */
export async function getStatistics({ actor, input }: { actor: Actor | null; input: unknown }): Promise<StatisticsReport> {
  requirePermission(actor, 'statistics:read');
  const q = StatisticsQuery.parse(input);
  const db = getDb();

  const type = q.device_type ? await findDeviceType(db, q.device_type) : null;
  const lot = q.lot ? await findLot(db, q.lot) : null;
  if (type && lot && lot.deviceTypeId !== type.id) {
    throw new AppError('statistics_lot_of_other_type', { lot: lot.code, typeName: type.name }, {
      fields: [{ field: 'lot', message: `lot ${lot.code} is not of device type ${type.name}` }],
    });
  }

  const where: SQL[] = [];
  if (type) where.push(eq(schema.part.deviceTypeId, type.id));
  if (lot) where.push(eq(schema.part.lotId, lot.id));
  const dateColumn = q.date_basis === 'lot' ? schema.lot.receivedAt : schema.fit.createdAt;
  if (q.from) where.push(gte(dateColumn, q.from));
  if (q.to) where.push(lte(dateColumn, q.to));
  const rows = await loadRows(db, where);

  const typeIds = new Set(rows.map((r) => r.deviceTypeId));
  if (type) typeIds.add(type.id);
  if (lot) typeIds.add(lot.deviceTypeId);
  const ids = [...typeIds];
  const types = ids.length ? await db.select().from(schema.deviceType).where(inArray(schema.deviceType.id, ids)).orderBy(asc(schema.deviceType.name)) : [];
  const plans = ids.length
    ? await db
        .select({ planId: schema.binPlan.id, deviceTypeId: schema.binPlan.deviceTypeId })
        .from(schema.binPlan)
        .where(and(inArray(schema.binPlan.deviceTypeId, ids), eq(schema.binPlan.isActive, true)))
    : [];
  const bins = plans.length
    ? await db
        .select({ binPlanId: schema.bin.binPlanId, code: schema.bin.code, label: schema.bin.label, ranges: schema.bin.ranges })
        .from(schema.bin)
        .where(inArray(schema.bin.binPlanId, plans.map((p) => p.planId)))
        .orderBy(asc(schema.bin.id))
    : [];

  // For one lot, the trend shows every lot of its type (within a lot-receipt range) around it.
  let trendRows = rows;
  if (lot) {
    const trendWhere: SQL[] = [eq(schema.part.deviceTypeId, lot.deviceTypeId)];
    if (q.date_basis === 'lot' && q.from) trendWhere.push(gte(schema.lot.receivedAt, q.from));
    if (q.date_basis === 'lot' && q.to) trendWhere.push(lte(schema.lot.receivedAt, q.to));
    trendRows = await loadRows(db, trendWhere);
  }
  const trendLotIds = [...new Set(trendRows.map((r) => r.lotId).filter((id): id is number => id !== null))];
  const lots = trendLotIds.length
    ? await db
        .select({ id: schema.lot.id, code: schema.lot.code, supplier: schema.lot.supplier, receivedAt: schema.lot.receivedAt, deviceTypeId: schema.lot.deviceTypeId })
        .from(schema.lot)
        .where(inArray(schema.lot.id, trendLotIds))
    : [];

  const groups = types.map((t) => {
    const planIds = plans.filter((p) => p.deviceTypeId === t.id).map((p) => p.planId);
    const info: StatisticsTypeInfo = {
      id: t.id,
      name: t.name,
      channel: t.channel,
      vdsTestV: t.vdsTestV,
      idssMinA: t.idssMinA,
      idssMaxA: t.idssMaxA,
      vpMinV: t.vpMinV,
      vpMaxV: t.vpMaxV,
      bins: bins.filter((b) => planIds.includes(b.binPlanId)).map((b) => ({ code: b.code, label: b.label, ranges: (b.ranges ?? []) as BinRangeJson[] })),
    };
    const trendLots: TrendLotInfo[] = lots.filter((l) => l.deviceTypeId === t.id);
    return buildTypeStatistics({
      type: info,
      rows: rows.filter((r) => r.deviceTypeId === t.id),
      trendLots,
      trendRows: trendRows.filter((r) => r.deviceTypeId === t.id),
      selectedLotId: lot?.id ?? null,
      histogramBins: q.histogram_bins,
    });
  });

  return {
    selection: {
      device_type: type?.name ?? null,
      lot: lot?.code ?? null,
      from: q.from?.toISOString() ?? null,
      to: q.to?.toISOString() ?? null,
      date_basis: q.date_basis,
    },
    groups,
  };
}

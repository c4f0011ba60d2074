import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { z } from 'zod';
import { allowedNextStatuses, describePartStatus } from '~/core/stock/part-transitions';
import type { AwaitingLotList, PartLookup } from '~/contracts/stock';
import { cleanScannedSerial } from '~/core/stock/scan-batch';
import { getDb, schema } from '~/db/client';
import { alias } from 'drizzle-orm/pg-core';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';

const home = alias(schema.location, 'home_location');

/** What a scanned serial is and what may be done with it, before a batch is sent. */
export async function lookupPart({ actor, serial }: { actor: Actor | null; serial: string }): Promise<PartLookup> {
  requirePermission(actor, 'stock:read');
  const s = cleanScannedSerial(z.string().max(200).parse(serial));
  if (!s) throw new AppError('serial_missing');
  const [r] = await getDb()
    .select({
      serial: schema.part.serial,
      status: schema.part.status,
      type: schema.deviceType.name,
      lot: schema.lot.code,
      binCode: schema.bin.code,
      binLabel: schema.bin.label,
      active: schema.binPlan.isActive,
      location: schema.location.name,
      home: home.name,
      idssA: schema.fit.idssA,
      vpV: schema.fit.vpV,
    })
    .from(schema.part)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .leftJoin(schema.lot, eq(schema.lot.id, schema.part.lotId))
    .leftJoin(schema.bin, eq(schema.bin.id, schema.part.binId))
    .leftJoin(schema.binPlan, eq(schema.binPlan.id, schema.bin.binPlanId))
    .leftJoin(schema.location, eq(schema.location.id, schema.part.locationId))
    .leftJoin(home, eq(home.id, schema.bin.homeLocationId))
    .leftJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
    .where(eq(schema.part.serial, s));
  if (!r) throw new AppError('serial_unknown', { serial: s });
  const next = allowedNextStatuses(r.status);
  const binned = r.binCode !== null && Boolean(r.active);
  return {
    serial: r.serial,
    status: r.status,
    status_words: describePartStatus(r.status),
    device_type: r.type,
    lot: r.lot,
    bin_code: r.binCode,
    bin_label: r.binLabel,
    bin_in_active_plan: binned,
    location: r.location,
    home_location: r.home,
    idss_a: r.idssA,
    vp_v: r.vpV,
    can: {
      receive: (r.status === 'accepted' || r.status === 'returned') && binned,
      move: r.status === 'in_stock',
      scrap: next.includes('scrapped'),
      return: r.status === 'issued',
    },
  };
}

/** Lots with accepted parts not yet received: the stores' work waiting. */
export async function listAwaitingReceipt({ actor }: { actor: Actor | null }): Promise<AwaitingLotList> {
  requirePermission(actor, 'stock:read');
  const rows = await getDb()
    .select({
      lotId: schema.part.lotId,
      lot: schema.lot.code,
      type: schema.deviceType.name,
      accepted: sql<number>`count(*)::int`,
      unbinned: sql<number>`count(*) filter (where ${schema.part.binId} is null)::int`,
    })
    .from(schema.part)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .leftJoin(schema.lot, eq(schema.lot.id, schema.part.lotId))
    .where(and(inArray(schema.part.status, ['accepted'])))
    .groupBy(schema.part.lotId, schema.lot.code, schema.deviceType.name)
    .orderBy(asc(schema.deviceType.name), asc(schema.lot.code));
  return { lots: rows.map((r) => ({ lot_id: r.lotId, lot: r.lot, device_type: r.type, accepted: r.accepted, unbinned: r.unbinned })) };
}

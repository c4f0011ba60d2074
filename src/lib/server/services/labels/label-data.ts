import { partOperatingFigures } from '~/core/operating-point/part-operating-figures';
import { loadPartBases } from '../parts/part-basis';
import { and, asc, eq, inArray } from 'drizzle-orm';
import { formatQuantity } from '~/core/units/format-quantity';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { collectScanBatch } from '~/core/stock/scan-batch';
import { alias } from 'drizzle-orm/pg-core';

export interface LabelContent {
  /** What the barcode encodes: a bin code or a part serial. */
  barcodeText: string;
  title: string;
  lines: string[];
}

const home = alias(schema.location, 'home_location');

/** Bin labels for bins of one plan (or the given bin ids): code as barcode, ranges and home. */
export async function binLabels({ actor, binIds }: { actor: Actor | null; binIds: number[] }): Promise<LabelContent[]> {
  requirePermission(actor, 'stock:labels');
  if (!binIds.length) return [];
  const rows = await getDb()
    .select({ code: schema.bin.code, label: schema.bin.label, type: schema.deviceType.name, version: schema.binPlan.version, location: schema.location.name })
    .from(schema.bin)
    .innerJoin(schema.binPlan, eq(schema.binPlan.id, schema.bin.binPlanId))
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.binPlan.deviceTypeId))
    .leftJoin(schema.location, eq(schema.location.id, schema.bin.homeLocationId))
    .where(inArray(schema.bin.id, binIds))
    .orderBy(asc(schema.bin.id));
  return rows.map((r) => ({
    barcodeText: r.code,
    title: `${r.type} · ${r.code}`,
    lines: [...r.label.split(' · '), `plan v${r.version}${r.location ? ` · ${r.location}` : ''}`],
  }));
}

/**
 * Part labels: serial as barcode, type, bin, the two binning figures and where the part is
 * now (its own location, which a move changes; its bin's home only while it has none).
 */
export async function partLabels({ actor, serials }: { actor: Actor | null; serials: string[] }): Promise<{ labels: LabelContent[]; unknown: string[] }> {
  requirePermission(actor, 'stock:labels');
  const list = collectScanBatch(serials).serials.slice(0, 500);
  if (!list.length) return { labels: [], unknown: [] };
  const rows = await getDb()
    .select({ partId: schema.part.id, serial: schema.part.serial, type: schema.deviceType.name, bin: schema.bin.code, idssA: schema.fit.idssA, vpV: schema.fit.vpV, vds: schema.fit.idssVdsV, home: home.name, at: schema.location.name })
    .from(schema.part)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .leftJoin(schema.bin, eq(schema.bin.id, schema.part.binId))
    .leftJoin(home, eq(home.id, schema.bin.homeLocationId))
    .leftJoin(schema.location, eq(schema.location.id, schema.part.locationId))
    .leftJoin(schema.fit, and(eq(schema.fit.id, schema.part.currentFitId)))
    .where(inArray(schema.part.serial, list));
  const bySerial = new Map(rows.map((r) => [r.serial, r]));
  // IDSS as every view shows it: from the part's measurements at its test VDS, at 25 °C.
  const bases = await loadPartBases(getDb(), rows.map((r) => r.partId));
  const idssOf = (r: (typeof rows)[number]) => {
    const b = bases.get(r.partId);
    const e = b && r.vds !== null ? partOperatingFigures(b.basis, { kind: 'idss', vdsV: r.vds }) : null;
    return e?.usable ? e.figures.idssA : r.idssA;
  };
  const labels: LabelContent[] = [];
  for (const s of list) {
    const r = bySerial.get(s);
    if (!r) continue;
    const figures =
      r.idssA !== null && r.vpV !== null
        ? [`IDSS ${formatQuantity(idssOf(r)!, 'A', 2)} at ${r.vds} V`, `VP ${formatQuantity(r.vpV, 'V', 2)}`]
        : ['not yet fitted'];
    const where = r.at ?? (r.home ? `${r.home} (bin home)` : null);
    labels.push({ barcodeText: r.serial, title: r.serial, lines: [`${r.type}${r.bin ? ` · bin ${r.bin}` : ''}`, ...figures, ...(where ? [where] : [])] });
  }
  return { labels, unknown: list.filter((s) => !bySerial.has(s)) };
}

/**
 * Location labels: the location's barcode (what the stores scanner reads when moving parts)
 * with its name, description and what lives there.
 */
export async function locationLabels({ actor, locationIds }: { actor: Actor | null; locationIds: number[] }): Promise<LabelContent[]> {
  requirePermission(actor, 'stock:labels');
  if (!locationIds.length) return [];
  const rows = await getDb()
    .select({ id: schema.location.id, name: schema.location.name, barcode: schema.location.barcode, description: schema.location.description })
    .from(schema.location)
    .where(inArray(schema.location.id, locationIds))
    .orderBy(asc(schema.location.name));
  const homes = await getDb()
    .select({ locationId: schema.bin.homeLocationId, code: schema.bin.code, type: schema.deviceType.name })
    .from(schema.bin)
    .innerJoin(schema.binPlan, and(eq(schema.binPlan.id, schema.bin.binPlanId), eq(schema.binPlan.isActive, true)))
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.binPlan.deviceTypeId))
    .where(inArray(schema.bin.homeLocationId, locationIds))
    .orderBy(asc(schema.bin.code));
  return rows.map((r) => {
    const bins = homes.filter((h) => h.locationId === r.id);
    const binLine = bins.length
      ? `bins ${bins.slice(0, 4).map((b) => `${b.type} ${b.code}`).join(', ')}${bins.length > 4 ? ` +${bins.length - 4}` : ''}`
      : null;
    return { barcodeText: r.barcode, title: r.name, lines: [r.barcode, ...(r.description ? [r.description] : []), ...(binLine ? [binLine] : [])] };
  });
}

/**
 * In-stock parts with fits, written straight into the test database, for the match,
 * reservation and pick-list tests. Parameters are invented (demo-like: IDSS 2–20 mA, VTO
 * −0.6 to −4 V, LAMBDA 0.002–0.03 /V) from a seeded generator, so every run sees the same stock.
 */
import { and, eq, inArray, sql } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import type { JfetParams } from '~/core/jfet-model';
import { seededRandom } from '~/core/random/seeded-random';

export interface StockPart {
  id: number;
  serial: string;
  params: JfetParams;
  binCode: string;
  location: string;
  lot: string;
}

export interface StockOptions {
  typeName: string;
  channel?: 'n' | 'p';
  count: number;
  seed: number;
  serialPrefix: string;
  /** Parameters of part i; default: demo-like random draw. */
  params?: (i: number, rand: () => number) => JfetParams;
  /** Use this existing device type instead of creating one (e.g. the demo's WS-N30). */
  existingType?: boolean;
  lots?: number;
  locations?: number;
}

export function demoLikeParams(rand: () => number): JfetParams {
  const idss = 2e-3 + rand() * 18e-3;
  const vto = -0.6 - rand() * 3.4;
  return { vtoV: vto, betaAPerV2: idss / (vto * vto), lambdaPerV: 0.002 + rand() * 0.028, rsOhm: 0, rdOhm: 0 };
}

/** Creates (or finds) the type, its lots, locations, a two-bin plan, and `count` in-stock parts with fits. */
export async function insertMatchStock(o: StockOptions): Promise<{ typeId: number; parts: StockPart[] }> {
  const db = getDb();
  const rand = seededRandom(o.seed);
  let [type] = await db.select().from(schema.deviceType).where(eq(schema.deviceType.name, o.typeName));
  if (!type) {
    if (o.existingType) throw new Error(`device type ${o.typeName} is not seeded`);
    [type] = await db.insert(schema.deviceType).values({ name: o.typeName, channel: o.channel ?? 'n', vdsTestV: 10 }).returning();
  }
  const lotRows = [];
  for (let i = 0; i < (o.lots ?? 2); i++) {
    const code = `${o.serialPrefix}-LOT${i + 1}`;
    const [lot] = await db.insert(schema.lot).values({ code, deviceTypeId: type!.id }).onConflictDoNothing().returning();
    lotRows.push(lot ?? (await db.select().from(schema.lot).where(eq(schema.lot.code, code)))[0]!);
  }
  const locRows = [];
  for (let i = 0; i < (o.locations ?? 6); i++) {
    const name = `${o.serialPrefix} drawer ${i + 1}`;
    const [loc] = await db.insert(schema.location).values({ name, barcode: `LOC-${o.serialPrefix}-${i + 1}` }).onConflictDoNothing().returning();
    locRows.push(loc ?? (await db.select().from(schema.location).where(eq(schema.location.name, name)))[0]!);
  }
  // Bins: the type's active plan when it has one (the demo's), else a plan of our own.
  let [plan] = await db.select().from(schema.binPlan).where(and(eq(schema.binPlan.deviceTypeId, type!.id), eq(schema.binPlan.isActive, true)));
  if (!plan) {
    [plan] = await db
      .insert(schema.binPlan)
      .values({ deviceTypeId: type!.id, version: 1, name: 'match test plan', definition: { axes: [{ quantity: 'idss', edges: { kind: 'explicit', edges: [1e-4, 1] } }] }, isActive: true })
      .returning();
    await db.insert(schema.bin).values([
      { binPlanId: plan!.id, code: `${o.serialPrefix}-LO`, label: 'lower half (test)', ranges: [] },
      { binPlanId: plan!.id, code: `${o.serialPrefix}-HI`, label: 'upper half (test)', ranges: [] },
    ]);
  }
  const bins = await db.select().from(schema.bin).where(eq(schema.bin.binPlanId, plan!.id));

  const parts: StockPart[] = [];
  for (let i = 0; i < o.count; i++) {
    const params = o.params ? o.params(i, rand) : demoLikeParams(rand);
    const serial = `${o.serialPrefix}-${String(i + 1).padStart(4, '0')}`;
    const lot = lotRows[i % lotRows.length]!;
    const loc = locRows[Math.floor(rand() * locRows.length)]!;
    const bin = bins[i % bins.length]!;
    const [p] = await db
      .insert(schema.part)
      .values({ serial, deviceTypeId: type!.id, lotId: lot.id, status: 'in_stock', binId: bin.id, locationId: loc.id })
      .returning();
    const [sw] = await db.insert(schema.sweep).values({ partId: p!.id, vgsStepsV: [0], curves: [], pointCount: 0, temperatureC: 25 }).returning();
    const idss = params.betaAPerV2 * params.vtoV ** 2 * (1 + params.lambdaPerV * 10);
    const [f] = await db
      .insert(schema.fit)
      .values({
        sweepId: sw!.id,
        partId: p!.id,
        model: 'level1',
        engineVersion: 'match-test',
        vtoV: params.vtoV,
        betaAPerV2: params.betaAPerV2,
        lambdaPerV: params.lambdaPerV,
        rsOhm: params.rsOhm,
        rdOhm: params.rdOhm,
        idssA: idss,
        idssVdsV: 10,
        vpV: (o.channel ?? type!.channel) === 'n' ? params.vtoV : -params.vtoV,
        gfsS: (2 * idss) / Math.abs(params.vtoV),
        gosS: 0,
        rdsOnOhm: 1 / (2 * params.betaAPerV2 * Math.abs(params.vtoV)),
        rmsRel: 0.01,
        detail: {},
        review: 'auto_accepted',
      })
      .returning();
    await db.update(schema.part).set({ currentFitId: f!.id, updatedAt: sql`now()` }).where(eq(schema.part.id, p!.id));
    parts.push({ id: p!.id, serial, params, binCode: bin.code, location: loc.name, lot: lot.code });
  }
  return { typeId: type!.id, parts };
}

/** Current fit parameters of parts by serial, read from the database. */
export async function fitsBySerial(serials: string[]): Promise<Map<string, JfetParams & { status: string; typeId: number; partId: number }>> {
  const rows = await getDb()
    .select({ serial: schema.part.serial, status: schema.part.status, typeId: schema.part.deviceTypeId, partId: schema.part.id, f: schema.fit })
    .from(schema.part)
    .innerJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
    .where(inArray(schema.part.serial, serials));
  return new Map(
    rows.map((r) => [
      r.serial,
      { vtoV: r.f.vtoV, betaAPerV2: r.f.betaAPerV2, lambdaPerV: r.f.lambdaPerV, rsOhm: r.f.rsOhm, rdOhm: r.f.rdOhm, status: r.status, typeId: r.typeId, partId: r.partId },
    ]),
  );
}

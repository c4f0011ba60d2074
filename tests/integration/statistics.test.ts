import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { mean, quantile, sampleStandardDeviation } from 'simple-statistics';
import { closeDb, getDb, schema } from '~/db/client';
import { seededRandom } from '~/core/random/seeded-random';
import { signIn, type Session } from '../helpers/http';

/**
 * Lot statistics through HTTP, against figures computed here with simple-statistics over the
 * same rows. The rows (a device type, bin plan, two lots, parts, sweeps, fits) are our own.
 */

const RUN = Date.now().toString(36);
const TYPE = `STAT-N-${RUN}`;
const LOT_A = `STAT-A-${RUN}`;
const LOT_B = `STAT-B-${RUN}`;

interface Seeded {
  serial: string;
  lot: string;
  status: NonNullable<(typeof schema.part.$inferInsert)['status']>;
  bin: string | null;
  fit: { idssA: number; vpV: number; gosS: number; gfsS: number; createdAt: Date } | null;
}
const seeded: Seeded[] = [];
let session: Session;

beforeAll(async () => {
  const db = getDb();
  const [type] = await db
    .insert(schema.deviceType)
    .values({ name: TYPE, channel: 'n', vdsTestV: 10, idssMinA: 4e-3, idssMaxA: 16e-3, vpMinV: -4, vpMaxV: -1 })
    .returning();
  const [plan] = await db.insert(schema.binPlan).values({ deviceTypeId: type.id, version: 1, definition: { axes: [{ quantity: 'idss', edges: { kind: 'explicit', edges: [2e-3, 6e-3, 10e-3, 14e-3, 18e-3] } }] }, isActive: true }).returning();
  const bins = await db
    .insert(schema.bin)
    .values(['I1', 'I2', 'I3', 'HOLD'].map((code) => ({ binPlanId: plan.id, code, label: `bin ${code}`, ranges: [], isHold: code === 'HOLD' })))
    .returning();
  const binId = new Map(bins.map((b) => [b.code, b.id]));
  const lots = await db
    .insert(schema.lot)
    .values([
      { code: LOT_A, deviceTypeId: type.id, supplier: 'Weir Street Semis', receivedAt: new Date('2025-01-10T09:00:00Z') },
      { code: LOT_B, deviceTypeId: type.id, supplier: 'Weir Street Semis', receivedAt: new Date('2025-03-10T09:00:00Z') },
    ])
    .returning();
  const rnd = seededRandom(42);
  const statuses: Seeded['status'][] = ['accepted', 'in_stock', 'in_stock', 'reserved', 'needs_review', 'scrapped', 'measured'];
  for (const [li, lot] of lots.entries()) {
    const count = li === 0 ? 30 : 20;
    for (let i = 0; i < count; i++) {
      const idssA = (li === 0 ? 8e-3 : 9.5e-3) + (rnd() - 0.5) * 6e-3;
      const vpV = -(1.8 + rnd() * 1.6);
      const hasFit = i % 10 !== 9; // one part in ten has no current fit yet
      const status = hasFit ? statuses[i % statuses.length] : 'measured';
      const bin = hasFit && status !== 'scrapped' && status !== 'needs_review' ? (idssA < 7e-3 ? 'I1' : idssA < 10e-3 ? 'I2' : 'I3') : null;
      seeded.push({
        serial: `${lot.code}-${String(i).padStart(3, '0')}`,
        lot: lot.code,
        status,
        bin,
        fit: hasFit
          ? { idssA, vpV, gosS: 20e-6 + rnd() * 30e-6, gfsS: (2 * idssA) / Math.abs(vpV), createdAt: new Date(Date.UTC(2025, li === 0 ? 0 : 2, 12 + (i % 5))) }
          : null,
      });
    }
  }
  for (const s of seeded) {
    const lotId = lots.find((l) => l.code === s.lot)!.id;
    const [part] = await db
      .insert(schema.part)
      .values({ serial: s.serial, deviceTypeId: type.id, lotId, status: s.status, binId: s.bin ? binId.get(s.bin)! : null })
      .returning();
    if (!s.fit) continue;
    const [sweep] = await db.insert(schema.sweep).values({ partId: part.id, vgsStepsV: [0], curves: [], pointCount: 0 }).returning();
    const vto = s.fit.vpV;
    const [fit] = await db
      .insert(schema.fit)
      .values({
        sweepId: sweep.id,
        partId: part.id,
        model: 'level1',
        engineVersion: 'test',
        vtoV: vto,
        betaAPerV2: s.fit.idssA / (vto * vto),
        lambdaPerV: 0.002,
        idssA: s.fit.idssA,
        idssVdsV: 10,
        vpV: s.fit.vpV,
        gfsS: s.fit.gfsS,
        gosS: s.fit.gosS,
        rdsOnOhm: 100,
        rmsRel: 0.001,
        detail: {},
        review: 'auto_accepted',
        createdAt: s.fit.createdAt,
      })
      .returning();
    await db.update(schema.part).set({ currentFitId: fit.id }).where(eq(schema.part.id, part.id));
  }
  session = await signIn('inspector@demo.sluice.test');
});

afterAll(async () => {
  await closeDb();
});

async function stats(query: string) {
  const res = await session.fetch(`/api/statistics?${query}`);
  return { status: res.status, body: await res.json() };
}

const FIG = {
  idss_a: (f: NonNullable<Seeded['fit']>) => f.idssA,
  vp_v: (f: NonNullable<Seeded['fit']>) => f.vpV,
  gos_s: (f: NonNullable<Seeded['fit']>) => f.gosS,
  gfs_s: (f: NonNullable<Seeded['fit']>) => f.gfsS,
};

describe('GET /api/statistics for a lot', () => {
  it('gives mean, sd and percentiles equal to simple-statistics over the same fits', async () => {
    const { status, body } = await stats(`lot=${LOT_A}`);
    expect(status, JSON.stringify(body)).toBe(200);
    expect(body.groups).toHaveLength(1);
    const g = body.groups[0];
    const rows = seeded.filter((s) => s.lot === LOT_A);
    const fits = rows.filter((s) => s.fit).map((s) => s.fit!);
    expect(g.part_count).toBe(rows.length);
    expect(g.fitted_count).toBe(fits.length);
    for (const [key, get] of Object.entries(FIG)) {
      const values = fits.map(get);
      const f = g.figures[key];
      expect(f.n).toBe(values.length);
      expect(f.mean).toBeCloseTo(mean(values), 15);
      expect(f.sd).toBeCloseTo(sampleStandardDeviation(values), 15);
      const [p5, p25, p50, p75, p95] = quantile(values, [0.05, 0.25, 0.5, 0.75, 0.95]);
      expect([f.p5, f.p25, f.median, f.p75, f.p95]).toEqual([p5, p25, p50, p75, p95].map((v) => expect.closeTo(v, 15)));
      expect(f.histogram.reduce((s: number, b: { count: number }) => s + b.count, 0)).toBe(values.length);
    }
  });

  it('gives Cpk against the type limits: min(USL − µ, µ − LSL)/3σ (common practice)', async () => {
    const { body } = await stats(`lot=${LOT_A}`);
    const f = body.groups[0].figures;
    const fits = seeded.filter((s) => s.lot === LOT_A && s.fit).map((s) => s.fit!);
    const idss = fits.map((x) => x.idssA);
    const vp = fits.map((x) => x.vpV);
    const cpkOf = (v: number[], lsl: number, usl: number) => Math.min(usl - mean(v), mean(v) - lsl) / (3 * sampleStandardDeviation(v));
    expect(f.idss_a.cpk).toBeCloseTo(cpkOf(idss, 4e-3, 16e-3), 12);
    expect(f.vp_v.cpk).toBeCloseTo(cpkOf(vp, -4, -1), 12);
    expect([f.vp_v.lsl, f.vp_v.usl]).toEqual([-4, -1]);
    expect(f.gos_s.cpk).toBeNull();
  });

  it('counts the yield and the share per bin', async () => {
    const { body } = await stats(`lot=${LOT_A}`);
    const g = body.groups[0];
    const rows = seeded.filter((s) => s.lot === LOT_A);
    const accepted = rows.filter((s) => ['accepted', 'in_stock', 'reserved', 'issued', 'returned'].includes(s.status)).length;
    expect(g.yield.total).toBe(rows.length);
    expect(g.yield.accepted).toBe(accepted);
    expect(g.yield.in_review).toBe(rows.filter((s) => ['measured', 'needs_review', 'retest', 'quarantined'].includes(s.status)).length);
    expect(g.yield.rejected).toBe(rows.filter((s) => s.status === 'scrapped').length);
    expect(g.yield.yield_share).toBeCloseTo(accepted / rows.length, 15);
    const binned = rows.filter((s) => s.bin);
    expect(g.bins.map((b: { code: string }) => b.code)).toEqual(['I1', 'I2', 'I3', 'HOLD']);
    for (const b of g.bins) {
      const n = binned.filter((s) => s.bin === b.code).length;
      expect(b.count).toBe(n);
      expect(b.share).toBeCloseTo(n / binned.length, 15);
    }
    expect(g.unbinned_count).toBe(rows.length - binned.length);
  });

  it('shows the lot among every lot of its type in the trend, in order of receipt', async () => {
    const { body } = await stats(`lot=${LOT_A}`);
    const lots = body.groups[0].trend.lots;
    expect(lots.map((l: { lot_code: string }) => l.lot_code)).toEqual([LOT_A, LOT_B]);
    expect(lots.map((l: { selected: boolean }) => l.selected)).toEqual([true, false]);
    const meanOf = (lot: string) => mean(seeded.filter((s) => s.lot === lot && s.fit).map((s) => s.fit!.idssA));
    expect(lots[1].idss_a_mean).toBeCloseTo(meanOf(LOT_B), 15);
    // Two lots are not enough for a trend (three lots over 14 days or more): no slope, a reason.
    expect(body.groups[0].trend.drift_per_day.idss_a).toBeNull();
    expect(body.groups[0].trend.drift.idss_a).toMatchObject({ enough: false, lots: 2, per_day: null, se_per_day: null });
    expect(body.groups[0].trend.drift.idss_a.reason).toContain('Only 2 lots');
  });
});

describe('GET /api/statistics for a type and a date range', () => {
  it('pools every lot of the type', async () => {
    const { body } = await stats(`device_type=${TYPE}`);
    const fits = seeded.filter((s) => s.fit).map((s) => s.fit!.idssA);
    expect(body.groups[0].figures.idss_a.mean).toBeCloseTo(mean(fits), 15);
    expect(body.selection.device_type).toBe(TYPE);
  });

  it('filters by lot receipt or by fit date', async () => {
    const byLot = await stats(`device_type=${TYPE}&from=2025-03-01&date_basis=lot`);
    expect(byLot.body.groups[0].part_count).toBe(seeded.filter((s) => s.lot === LOT_B).length);
    // Fits of lot A were made on 12–16 January; the end date includes its whole day.
    const byFit = await stats(`device_type=${TYPE}&from=2025-01-13&to=2025-01-14`);
    const expected = seeded.filter((s) => s.fit && s.fit.createdAt >= new Date('2025-01-13') && s.fit.createdAt < new Date('2025-01-15'));
    expect(byFit.body.groups[0].fitted_count).toBe(expected.length);
    expect(byFit.body.groups[0].figures.vp_v.mean).toBeCloseTo(mean(expected.map((s) => s.fit!.vpV)), 15);
  });

  it('answers 400 naming the field for a bad date or range, 404 for an unknown lot', async () => {
    const bad = await stats('from=next-tuesday');
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].field).toBe('from');
    const reversed = await stats('from=2025-03-01&to=2025-01-01');
    expect(reversed.status).toBe(400);
    expect(reversed.body.error.fields[0].field).toBe('to');
    const basis = await stats('date_basis=week');
    expect(basis.status).toBe(400);
    expect(basis.body.error.fields[0].field).toBe('date_basis');
    const unknown = await stats('lot=NO-SUCH-LOT');
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.message).toContain('NO-SUCH-LOT');
  });

  it('is refused to a role without statistics:read', async () => {
    const stores = await signIn('stores@demo.sluice.test');
    expect((await stores.fetch(`/api/statistics?lot=${LOT_A}`)).status).toBe(403);
  });
});

describe('GET /api/statistics/export', () => {
  function parseCsv(text: string): string[][] {
    return text
      .trim()
      .split('\r\n')
      .map((line) => line.split(','));
  }

  it('returns each table as text/csv with SI units in the header', async () => {
    const res = await session.fetch(`/api/statistics/export?table=summary&lot=${LOT_A}`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toContain('text/csv');
    expect(res.headers.get('content-disposition')).toContain('.csv');
    const [header, ...rows] = parseCsv(await res.text());
    expect(header.slice(0, 6)).toEqual(['device_type', 'figure', 'unit', 'n', 'mean', 'sd']);
    const idss = rows.find((r) => r[1] === 'idss_a')!;
    const fits = seeded.filter((s) => s.lot === LOT_A && s.fit).map((s) => s.fit!.idssA);
    expect(Number(idss[3])).toBe(fits.length);
    expect(Number(idss[4])).toBeCloseTo(mean(fits), 15);

    for (const [table, rowsExpected] of [
      ['scatter', fits.length],
      ['trend', 2],
      ['bins', 5],
    ] as const) {
      const r = await session.fetch(`/api/statistics/export?table=${table}&lot=${LOT_A}`);
      expect(r.status).toBe(200);
      expect(parseCsv(await r.text()).length - 1).toBe(rowsExpected);
    }
    const hist = parseCsv(await (await session.fetch(`/api/statistics/export?table=histograms&lot=${LOT_A}`)).text());
    expect(hist[0]).toEqual(['device_type', 'figure', 'unit', 'range_lo', 'range_hi', 'count']);
    expect(hist.filter((r) => r[1] === 'vp_v').reduce((s, r) => s + Number(r[5]), 0)).toBe(fits.length);
  });

  it('answers 400 naming the table for an unknown one', async () => {
    const res = await session.fetch(`/api/statistics/export?table=everything&lot=${LOT_A}`);
    expect(res.status).toBe(400);
    expect((await res.json()).error.fields[0].field).toBe('table');
  });
});

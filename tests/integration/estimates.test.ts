import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { closeDb, getDb, schema } from '~/db/client';
import { anonymous, signIn, type Session } from '../helpers/http';
import { fieldPathWords } from '~/core/field-path-words';

/**
 * Stage estimates through HTTP. Stored parts are inserted directly (a device type, lot, sweep
 * and fit of our own), so these checks do not depend on the intake code.
 */

const RUN = Date.now().toString(36);
const SERIAL = {
  textbook: `EST-${RUN}-BOYL`,
  bench: `EST-${RUN}-BENCH`,
  second: `EST-${RUN}-B2`,
  noFit: `EST-${RUN}-NOFIT`,
};

async function insertPart(typeId: number, lotId: number, serial: string, fit: { idssA: number; vpV: number; lambdaPerV?: number } | null) {
  const db = getDb();
  const [part] = await db.insert(schema.part).values({ serial, deviceTypeId: typeId, lotId, status: fit ? 'accepted' : 'measured' }).returning();
  if (!fit) return part;
  const [sweep] = await db
    .insert(schema.sweep)
    .values({ partId: part.id, vgsStepsV: [0], curves: [], pointCount: 0 })
    .returning();
  const vto = -Math.abs(fit.vpV);
  const lambda = fit.lambdaPerV ?? 0;
  const beta = fit.idssA / (vto * vto);
  const [row] = await db
    .insert(schema.fit)
    .values({
      sweepId: sweep.id,
      partId: part.id,
      model: 'level1',
      engineVersion: 'test',
      vtoV: vto,
      betaAPerV2: beta,
      lambdaPerV: lambda,
      idssA: fit.idssA,
      idssVdsV: 10,
      vpV: fit.vpV,
      gfsS: (2 * fit.idssA) / Math.abs(fit.vpV),
      gosS: 0,
      rdsOnOhm: Math.abs(fit.vpV) / (2 * fit.idssA),
      rmsRel: 0.001,
      detail: {},
      review: 'auto_accepted',
    })
    .returning();
  await db.update(schema.part).set({ currentFitId: row.id }).where(eq(schema.part.id, part.id));
  return part;
}

let designer: Session;
let partIds: Record<string, number>;
let designerId: string;

beforeAll(async () => {
  const db = getDb();
  const [type] = await db
    .insert(schema.deviceType)
    .values({ name: `EST-N-${RUN}`, channel: 'n', vdsTestV: 10, idssMinA: 1e-3, idssMaxA: 20e-3, vpMinV: -5, vpMaxV: -0.5 })
    .returning();
  const [lot] = await db.insert(schema.lot).values({ code: `EST-LOT-${RUN}`, deviceTypeId: type.id }).returning();
  partIds = {};
  partIds.textbook = (await insertPart(type.id, lot.id, SERIAL.textbook, { idssA: 6e-3, vpV: -3 })).id;
  partIds.bench = (await insertPart(type.id, lot.id, SERIAL.bench, { idssA: 10.12e-3, vpV: -3.9 })).id;
  partIds.second = (await insertPart(type.id, lot.id, SERIAL.second, { idssA: 10.4e-3, vpV: -3.95 })).id;
  partIds.noFit = (await insertPart(type.id, lot.id, SERIAL.noFit, null)).id;
  designer = await signIn('designer@demo.sluice.test');
  const [u] = await db.select().from(schema.user).where(eq(schema.user.email, 'designer@demo.sluice.test'));
  designerId = u.id;
});

afterAll(async () => {
  await closeDb();
});

// The bench case of issue 6 (common practice, no published source): LO 400 mV peak on the
// source, RF 132 mV peak on the gate, VGS0 −1.78 V, into 48 Ω; LO fundamental measured −28.4 dBV.
const BENCH = {
  vgs0_v: -1.78,
  load_ohm: 48,
  lo: { amplitude_v: 0.4, terminal: 'source', frequency_hz: 10e6 },
  rf: { amplitude_v: 0.132, terminal: 'gate', frequency_hz: 10.7e6 },
};
const BENCH_PART = { idss_a: 10.12e-3, vp_v: -3.9 };

async function post(path: string, json: unknown) {
  const res = await designer.fetch(path, { method: 'POST', json });
  return { status: res.status, body: await res.json() };
}

type Product = { name: string; frequency_hz: number; current_a: number; dbv: number; dbm: number };
const product = (body: { products: Product[] }, name: string) => body.products.find((p) => p.name === name)!;

describe('POST /api/estimates/mixer', () => {
  it('reproduces the bench LO level within 0.2 dB without the leak correction (common practice, no published source)', async () => {
    const { status, body } = await post('/api/estimates/mixer', { ...BENCH_PART, ...BENCH });
    expect(status, JSON.stringify(body)).toBe(200);
    expect(body.products.map((p: Product) => p.name)).toEqual(['rf', 'lo', 'lo_minus_rf', 'lo_plus_rf', 'two_lo', 'two_rf']);
    expect(Math.abs(product(body, 'lo').dbv - -28.4)).toBeLessThanOrEqual(0.2);
    // Derived: IDSS·a·b/VP² for the sum and difference; conversion transconductance IDSS·b/VP².
    expect(product(body, 'lo_minus_rf').current_a).toBeCloseTo((10.12e-3 * 0.132 * 0.4) / 3.9 ** 2, 12);
    expect(product(body, 'lo_minus_rf').frequency_hz).toBeCloseTo(0.7e6, 3);
    expect(body.conversion_transconductance_s).toBeCloseTo((10.12e-3 * 0.4) / 3.9 ** 2, 12);
    // dBm into the 48 Ω load is the same RMS voltage as power (derived).
    const lo = product(body, 'lo');
    expect(lo.dbm).toBeCloseTo(lo.dbv - 10 * Math.log10(48 * 1e-3), 9);
  });

  it('stays within 0.2 dB of the bench level with 3.6 mV of LO on the gate and 17.9 mV of RF on the source (common practice, no published source)', async () => {
    const plain = await post('/api/estimates/mixer', { ...BENCH_PART, ...BENCH });
    const { status, body } = await post('/api/estimates/mixer', {
      ...BENCH_PART,
      ...BENCH,
      lo: { ...BENCH.lo, leak_v: 0.0036 },
      rf: { ...BENCH.rf, leak_v: 0.0179 },
    });
    expect(status, JSON.stringify(body)).toBe(200);
    expect(Math.abs(product(body, 'lo').dbv - -28.4)).toBeLessThanOrEqual(0.2);
    // Derived: the net drive is (A − leak), so the LO level drops by 20·log10(0.4/0.3964).
    expect(product(plain.body, 'lo').dbv - product(body, 'lo').dbv).toBeCloseTo(20 * Math.log10(0.4 / 0.3964), 9);
    expect(body.effective_drive).toEqual({ rf_v: expect.closeTo(0.132 - 0.0179, 12), lo_v: expect.closeTo(-(0.4 - 0.0036), 12) });
  });

  it('a probe capacitance lowers each product by its |Z| at that frequency (derived)', async () => {
    const { body } = await post('/api/estimates/mixer', { ...BENCH_PART, ...BENCH, probe_capacitance_f: 100e-12 });
    const lo = product(body, 'lo');
    const z = 48 / Math.sqrt(1 + (2 * Math.PI * 10e6 * 48 * 100e-12) ** 2);
    expect(lo.dbv).toBeCloseTo(20 * Math.log10((lo.current_a * z) / Math.SQRT2), 9);
  });

  it('gives the same for the stored part by serial, in the body and on the part path', async () => {
    const raw = await post('/api/estimates/mixer', { ...BENCH_PART, ...BENCH });
    const bySerial = await post('/api/estimates/mixer', { serial: SERIAL.bench, ...BENCH });
    expect(bySerial.status, JSON.stringify(bySerial.body)).toBe(200);
    expect(bySerial.body.part.serial).toBe(SERIAL.bench);
    expect(bySerial.body.products).toEqual(raw.body.products);
    const byPath = await post(`/api/estimates/parts/${SERIAL.bench}/mixer`, BENCH);
    expect(byPath.status).toBe(200);
    expect(product(byPath.body, 'lo').dbv).toBeCloseTo(product(raw.body, 'lo').dbv, 12);
  });

  it('biases by a source resistor at the square-law self-bias point (Boylestad: 1.6 kΩ → VGS ≈ −1.73 V)', async () => {
    const { status, body } = await post('/api/estimates/mixer', { idss_a: 6e-3, vp_v: -3, source_resistor_ohm: 1600, load_ohm: 1000, lo: BENCH.lo, rf: BENCH.rf });
    expect(status, JSON.stringify(body)).toBe(200);
    expect(body.bias.vgs0_v).toBeCloseTo(-1.73, 2);
  });

  it.each([
    ['a negative LO amplitude', { lo: { ...BENCH.lo, amplitude_v: -0.1 } }, 'lo.amplitude_v'],
    ['no load', { load_ohm: undefined }, 'load_ohm'],
    ['a bias beyond pinch-off', { vgs0_v: -4.5 }, 'vgs0_v'],
    ['a zero pinch-off', { vp_v: 0 }, 'vp_v'],
    ['a terminal that is neither', { rf: { ...BENCH.rf, terminal: 'drain' } }, 'rf.terminal'],
    ['two biases at once', { source_resistor_ohm: 100 }, 'vgs0_v'],
    ['a frequency given as text', { lo: { ...BENCH.lo, frequency_hz: '10 MHz' } }, 'lo.frequency_hz'],
  ])('answers 400 naming the field for %s', async (_what, patch, field) => {
    const { status, body } = await post('/api/estimates/mixer', { ...BENCH_PART, ...BENCH, ...patch });
    expect(status, JSON.stringify(body)).toBe(400);
    expect(body.error.code).toBe('invalid_input');
    expect(body.error.fields.map((f: { field: string }) => f.field)).toContain(field);
    // The message names the field in words (issue 13, item 12); `fields` keeps the path for programs.
    expect(body.error.message).toContain(fieldPathWords(field.split('.')));
    expect(body.error.message).not.toContain(field.includes('.') ? field : `${field}:`);
  });

  it('answers 404 for an unknown serial and 409 for a part without a fit, naming the serial', async () => {
    const unknown = await post('/api/estimates/mixer', { serial: 'NO-SUCH-PART', ...BENCH });
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.message).toContain('NO-SUCH-PART');
    const noFit = await post('/api/estimates/mixer', { serial: SERIAL.noFit, ...BENCH });
    expect(noFit.status).toBe(409);
    expect(noFit.body.error.message).toContain(SERIAL.noFit);
  });

  it('refuses people without estimates:use and the anonymous', async () => {
    const stores = await signIn('stores@demo.sluice.test');
    expect((await stores.fetch('/api/estimates/mixer', { method: 'POST', json: { ...BENCH_PART, ...BENCH } })).status).toBe(403);
    const anon = await anonymous('/api/estimates/mixer', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ ...BENCH_PART, ...BENCH }) });
    expect(anon.status).toBe(401);
  });
});

describe('POST /api/estimates/self-bias', () => {
  it('Boylestad self-bias for a stored part (IDSS 6 mA, VP −3 V, RS 1.6 kΩ → ID ≈ 1.08 mA, VGS ≈ −1.73 V)', async () => {
    const { status, body } = await post('/api/estimates/self-bias', { serial: SERIAL.textbook, vds_v: 10, source_resistor_ohm: 1600, drain_load_ohm: 2000 });
    expect(status, JSON.stringify(body)).toBe(200);
    const p = body.for_source_resistor;
    expect(Math.abs(p.drain_current_a - 1.08e-3)).toBeLessThan(0.01e-3);
    expect(Math.abs(p.vgs_v - -1.73)).toBeLessThan(0.01);
    // Derived: gm = gm0·(1 − VGS/VP) with gm0 = 2·IDSS/|VP| = 4 mS; λ = 0 so gos = 0 and the bypassed gain is −gm·RD.
    expect(p.gm_s).toBeCloseTo(4e-3 * (1 - p.vgs_v / -3), 9);
    expect(p.gain.bypassed_v_per_v).toBeCloseTo(-p.gm_s * 2000, 9);
    expect(p.gain.unbypassed_v_per_v).toBeCloseTo((-p.gm_s * 2000) / (1 + p.gm_s * 1600), 9);
    expect(body.part.serial).toBe(SERIAL.textbook);
  });

  it('finds the resistor for a target current by solving the model (the Boylestad point in reverse)', async () => {
    const { status, body } = await post(`/api/estimates/parts/${SERIAL.textbook}/self-bias`, { vds_v: 10, target_drain_current_a: 1.0796e-3 });
    expect(status, JSON.stringify(body)).toBe(200);
    expect(Math.abs(body.for_target_current.source_resistor_ohm - 1600) / 1600).toBeLessThan(0.005);
  });

  it('Boylestad gm: IDSS 8 mA, VP −4 V at VGS −1.5 V gives gm = 2.5 mS (data-sheet values)', async () => {
    // Derived: ID = 8 mA·(1 − 1.5/4)² = 3.125 mA, so RS = 1.5 V / 3.125 mA = 480 Ω sets VGS = −1.5 V.
    const { status, body } = await post('/api/estimates/self-bias', { idss_a: 8e-3, vp_v: -4, vds_v: 10, source_resistor_ohm: 480 });
    expect(status, JSON.stringify(body)).toBe(200);
    expect(body.for_source_resistor.vgs_v).toBeCloseTo(-1.5, 9);
    expect(body.for_source_resistor.gm_s).toBeCloseTo(2.5e-3, 9);
  });

  it('answers 400 naming the field for a target at or above IDSS, and for missing choices', async () => {
    const above = await post('/api/estimates/self-bias', { serial: SERIAL.textbook, vds_v: 10, target_drain_current_a: 7e-3 });
    expect(above.status).toBe(400);
    expect(above.body.error.fields[0].field).toBe('target_drain_current_a');
    const none = await post('/api/estimates/self-bias', { idss_a: 6e-3, vp_v: -3, vds_v: 10 });
    expect(none.status).toBe(400);
    expect(none.body.error.fields[0].field).toBe('target_drain_current_a');
    const both = await post('/api/estimates/self-bias', { serial: SERIAL.textbook, idss_a: 6e-3, vds_v: 10, source_resistor_ohm: 100 });
    expect(both.status).toBe(400);
    expect(both.body.error.fields.map((f: { field: string }) => f.field)).toContain('idss_a');
    const negative = await post('/api/estimates/self-bias', { idss_a: 6e-3, vp_v: -3, vds_v: 10, source_resistor_ohm: -5 });
    expect(negative.status).toBe(400);
    expect(negative.body.error.fields[0].field).toBe('source_resistor_ohm');
  });
});

describe('POST /api/estimates/set', () => {
  it('compares each part at one current: ΔVGS and gm mismatch agree with the per-part estimates (derived)', async () => {
    const id = 2e-3;
    const { status, body } = await post('/api/estimates/set', { serials: [SERIAL.bench, SERIAL.second], target_drain_current_a: id, vds_v: 10, drain_load_ohm: 1000, lo_amplitude_v: 0.4 });
    expect(status, JSON.stringify(body)).toBe(200);
    const [a, b] = await Promise.all(
      [SERIAL.bench, SERIAL.second].map((serial) => post('/api/estimates/self-bias', { serial, vds_v: 10, target_drain_current_a: id })),
    );
    const pa = a.body.for_target_current;
    const pb = b.body.for_target_current;
    const pair = body.sets[0].pairs[0];
    expect(pair.dvgs_v).toBeCloseTo(pa.vgs_v - pb.vgs_v, 12);
    const gmMean = (pa.gm_s + pb.gm_s) / 2;
    expect(pair.gm_mismatch).toBeCloseTo(Math.abs(pa.gm_s - pb.gm_s) / gmMean, 12);
    expect(pair.input_offset_v).toBeCloseTo(Math.abs(pa.vgs_v - pb.vgs_v), 12);
    expect(pair.output_offset_v).toBeCloseTo(gmMean * Math.abs(pa.vgs_v - pb.vgs_v) * 1000, 12);
    expect(pair.lo_leakage_relative_db).toBeCloseTo(20 * Math.log10(pair.gm_mismatch / 2), 9);
    expect(pair.idss_ratio).toBeCloseTo(10.12 / 10.4, 12);
  });

  it('reads the sets of a reservation, and reports a part without a fit in its own row', async () => {
    const db = getDb();
    const [res] = await db
      .insert(schema.reservation)
      .values({ designerUserId: designerId, purpose: 'estimates test', expiresAt: new Date(Date.now() + 86_400_000) })
      .returning();
    await db.insert(schema.reservationPart).values([
      { reservationId: res.id, partId: partIds.bench, setIndex: 0, role: 'left', vgsV: -1.2, gmS: 3e-3, idssA: 10.12e-3 },
      { reservationId: res.id, partId: partIds.second, setIndex: 0, role: 'right', vgsV: -1.21, gmS: 3e-3, idssA: 10.4e-3 },
      { reservationId: res.id, partId: partIds.textbook, setIndex: 1, role: 'left', vgsV: -1, gmS: 2e-3, idssA: 6e-3 },
      { reservationId: res.id, partId: partIds.noFit, setIndex: 1, role: 'right', vgsV: -1, gmS: 2e-3, idssA: 6e-3 },
    ]);
    const { status, body } = await post('/api/estimates/set', { reservation_id: res.id, target_drain_current_a: 1e-3, vds_v: 10 });
    expect(status, JSON.stringify(body)).toBe(200);
    expect(body.sets.map((s: { set_index: number }) => s.set_index)).toEqual([0, 1]);
    expect(body.sets[0].parts.map((p: { role: string }) => p.role)).toEqual(['left', 'right']);
    expect(body.sets[0].pairs).toHaveLength(1);
    expect(body.sets[1].parts[1].error).toContain(SERIAL.noFit);
    expect(body.sets[1].pairs).toHaveLength(0);
  });

  it('answers 400 naming the field for one serial or a negative current', async () => {
    const one = await post('/api/estimates/set', { serials: [SERIAL.bench], target_drain_current_a: 1e-3, vds_v: 10 });
    expect(one.status).toBe(400);
    expect(one.body.error.fields[0].field).toBe('serials');
    const neg = await post('/api/estimates/set', { serials: [SERIAL.bench, SERIAL.second], target_drain_current_a: -1e-3, vds_v: 10 });
    expect(neg.status).toBe(400);
    expect(neg.body.error.fields[0].field).toBe('target_drain_current_a');
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { vgsAtCurrentV, type JfetParams } from '~/core/jfet-model';
import { modelCardName } from '~/core/fit/model-card';
import { closeDb, getDb, schema } from '~/db/client';
import type { ProposalView } from '~/contracts/match';
import { signIn, type Session } from '../helpers/http';
import { fitsBySerial, insertMatchStock } from './match-fixture';
import { partOperatingFigures } from '~/core/operating-point/part-operating-figures';
import { loadPartBases } from '~/lib/server/services/parts/part-basis';

let designer: Session;
let stores: Session;
let inspector: Session;

beforeAll(async () => {
  [designer, stores, inspector] = await Promise.all([
    signIn('designer@demo.sluice.test'),
    signIn('stores@demo.sluice.test'),
    signIn('inspector@demo.sluice.test'),
  ]);
  // Demo-like stock of WS-N30: what the demo seed put in stock, topped up to ~240 parts when
  // the demo lots are not there yet.
  const [{ n }] = await getDb()
    .select({ n: sql<number>`count(*)::int` })
    .from(schema.part)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .where(sql`${schema.deviceType.name} = 'WS-N30' AND ${schema.part.status} = 'in_stock'`);
  if (n < 150) await insertMatchStock({ typeName: 'WS-N30', existingType: true, count: 240, seed: 30, serialPrefix: 'MTN' });
});
afterAll(async () => {
  await closeDb();
});

async function propose(body: Record<string, unknown>, who = designer): Promise<ProposalView> {
  const res = await who.fetch('/api/match/proposals', { method: 'POST', json: body });
  const json = await res.json();
  if (res.status !== 201) throw new Error(`proposal answered ${res.status}: ${JSON.stringify(json)}`);
  return json as ProposalView;
}

/**
 * Largest number of disjoint pairs with |ΔVGS| ≤ tol, and the least Σ ΔVGS for that number,
 * by trying every pairing (exhaustive; fine for ≤ 16 parts).
 */
function bruteForcePairs(vgs: number[], tol: number): { count: number; cost: number } {
  let best = { count: 0, cost: 0 };
  const used = new Array(vgs.length).fill(false);
  const walk = (from: number, count: number, cost: number) => {
    if (count > best.count || (count === best.count && cost < best.cost - 1e-15)) best = { count, cost };
    let i = from;
    while (i < vgs.length && used[i]) i++;
    if (i >= vgs.length) return;
    used[i] = true;
    for (let j = i + 1; j < vgs.length; j++) {
      if (used[j] || Math.abs(vgs[i]! - vgs[j]!) > tol) continue;
      used[j] = true;
      walk(i + 1, count + 1, cost + Math.abs(vgs[i]! - vgs[j]!));
      used[j] = false;
    }
    used[i] = false;
    walk(i + 1, count, cost); // part i left out
  };
  walk(0, 0, 0);
  return best;
}

describe('match proposals on demo-like stock', () => {
  it('5 matched pairs at 1 mA, VDS 10 V, |ΔVGS| ≤ 10 mV all meet the tolerance, re-checked from the stored fits', async () => {
    const p = await propose({ device_type: 'WS-N30', shape: 'pair', count: 5, id_a: 1e-3, vds_v: 10, max_dvgs_v: 0.01 });
    expect(p.id).toMatch(/^[0-9a-f-]{36}$/);
    expect(p.sets).toHaveLength(5);
    const serials = p.sets.flatMap((s) => s.parts.map((x) => x.serial));
    expect(new Set(serials).size).toBe(10); // disjoint
    const fits = await fitsBySerial(serials);
    const bases = await loadPartBases(getDb(), [...fits.values()].map((f) => f.partId));
    const basisOf = (serial: string) => [...bases.values()].find((b) => b.serial === serial)!.basis;
    for (const set of p.sets) {
      expect(set.parts).toHaveLength(2);
      // Re-computed from each part's stored current fit and measurements through the one source of
      // operating-point figures (checked against ngspice in tests/unit/operating-point-ngspice.test.ts);
      // the guard: ΔVGS + 2σ within the tolerance.
      const figs = set.parts.map((x) => {
        const e = partOperatingFigures(basisOf(x.serial), { kind: 'current', idA: 1e-3, vdsV: 10 });
        if (!e.usable) throw new Error(e.reason);
        return e.figures;
      });
      const vgs = figs.map((f) => f.vgsV);
      const sigma = Math.hypot(figs[0]!.vgsSigmaV || 0, figs[1]!.vgsSigmaV || 0);
      expect(Math.abs(vgs[0]! - vgs[1]!) + 2 * sigma).toBeLessThanOrEqual(0.01 + 1e-12);
      expect(set.dvgs_v).toBeCloseTo(Math.abs(vgs[0]! - vgs[1]!), 12);
      expect(set.dvgs_sigma_v).toBeCloseTo(sigma, 12);
      for (const [k, part] of set.parts.entries()) {
        expect(part.vgs_v).toBeCloseTo(vgs[k]!, 12); // N-channel: datasheet sign is the model's sign
        expect(part.gm_s).toBeCloseTo(figs[k]!.gmS, 12);
        if (figs[k]!.source === 'model') {
        expect(fits.get(part.serial)!.status).toBe('in_stock');
        expect(part.location).not.toBeNull();
        expect(part.bin_code).not.toBeNull();
        expect(part.id_a).toBeCloseTo(1e-3, 15);
        // gm at ID = 2·sqrt(BETA·ID·(1+λ·VDS')) at the internal VDS' = VDS − ID·(RS+RD) (PRODUCT.md),
        // degenerated by the fitted RS: gm_int/(1 + gm_int·RS) (derived, source degeneration).
        const f = fits.get(part.serial)!;
        const gmInt = 2 * Math.sqrt(f.betaAPerV2 * 1e-3 * (1 + f.lambdaPerV * (10 - 1e-3 * (f.rsOhm + f.rdOhm))));
        expect(part.gm_s).toBeCloseTo(gmInt / (1 + gmInt * f.rsOhm), 12);
        expect(part.vgs_v).toBeCloseTo(vgsAtCurrentV(f, 1e-3, 10), 12);
        }
      }
    }
    expect(p.looser.all_times_2).toBe(5);
    // The stored proposal reads back the same.
    const again = await (await designer.fetch(`/api/match/proposals/${p.id}`)).json();
    expect(again.sets).toEqual(p.sets);
  });

  it('on a reduced stock, brute force finds no larger number of disjoint pairs (nor a smaller total ΔVGS)', async () => {
    for (const seed of [1, 2, 3]) {
      const prefix = `MTS${seed}`;
      // 14 parts whose VGS at 1 mA crowd within ~40 mV, so 10 mV windows overlap and the choice matters.
      const { parts } = await insertMatchStock({
        typeName: `MT-SMALL-${seed}`,
        count: 14,
        seed: 100 + seed,
        serialPrefix: prefix,
        params: (_i, rand): JfetParams => {
          const vto = -2 + rand() * 0.04;
          const beta = 1.5e-3 * (0.9 + rand() * 0.2);
          return { vtoV: vto, betaAPerV2: beta, lambdaPerV: 0.01, rsOhm: 0, rdOhm: 0 };
        },
      });
      const p = await propose({ device_type: `MT-SMALL-${seed}`, shape: 'pair', count: 7, id_a: 1e-3, vds_v: 10, max_dvgs_v: 0.01 });
      const fits = await fitsBySerial(parts.map((x) => x.serial));
      const vgs = parts.map((x) => vgsAtCurrentV(fits.get(x.serial)!, 1e-3, 10));
      const brute = bruteForcePairs(vgs, 0.01);
      expect(brute.count).toBeGreaterThan(0);
      expect(p.sets.length).toBe(brute.count);
      // Only ΔVGS is constrained, so the cost is Σ ΔVGS / 10 mV.
      expect(p.total_cost).toBeCloseTo(brute.cost / 0.01, 9);
      expect(p.guarantee.kind).toBe('exact');
    }
  });

  it('P-channel VGS is reported in datasheet sign (positive), from the N-equivalent fit', async () => {
    const { parts } = await insertMatchStock({ typeName: 'MT-P', channel: 'p', count: 30, seed: 7, serialPrefix: 'MTP' });
    const p = await propose({ device_type: 'MT-P', shape: 'pair', count: 2, id_a: -1e-3, vds_v: -10, max_dvgs_v: 0.05 });
    expect(p.sets.length).toBeGreaterThan(0);
    expect(p.device_type.channel).toBe('p');
    expect(p.operating_point.id_a).toBeCloseTo(-1e-3, 15);
    const bySerial = new Map(parts.map((x) => [x.serial, x]));
    for (const part of p.sets.flatMap((s) => s.parts)) {
      expect(part.vgs_v).toBeGreaterThan(0);
      expect(part.vgs_v).toBeCloseTo(-vgsAtCurrentV(bySerial.get(part.serial)!.params, 1e-3, 10), 12);
    }
  });

  it('cascode sets keep the lower part saturated with the margin asked (re-checked from the fits)', async () => {
    const { parts } = await insertMatchStock({ typeName: 'MT-CAS', count: 12, seed: 11, serialPrefix: 'MTC' });
    const margin = 0.3;
    const p = await propose({ device_type: 'MT-CAS', shape: 'cascode_pair', count: 4, id_a: 1e-3, vds_v: 10, cascode_margin_v: margin });
    expect(p.sets.length).toBeGreaterThan(0);
    const bySerial = new Map(parts.map((x) => [x.serial, x.params]));
    for (const set of p.sets) {
      const lower = set.parts.find((x) => x.role === 'lower')!;
      const upper = set.parts.find((x) => x.role === 'upper')!;
      const pu = bySerial.get(upper.serial)!;
      const pl = bySerial.get(lower.serial)!;
      const vgsU = vgsAtCurrentV(pu, 1e-3, 10);
      // Derived (PRODUCT.md): VDS(lower) = −VGS(upper); saturated when −VGS(upper) ≥ VGS(lower) − VTO(lower) + margin.
      const vgsL = vgsAtCurrentV(pl, 1e-3, -vgsU);
      expect(-vgsU).toBeGreaterThanOrEqual(vgsL - pl.vtoV + margin - 1e-12);
      expect(lower.vds_v).toBeCloseTo(-vgsU, 9);
    }
  });

  it('bins limit the candidates; an unknown bin is refused by name', async () => {
    const p = await propose({ device_type: 'MT-CAS', shape: 'pair', count: 6, id_a: 1e-3, vds_v: 10, max_dvgs_v: 0.5, bins: ['MTC-LO'] });
    for (const part of p.sets.flatMap((s) => s.parts)) expect(part.bin_code).toBe('MTC-LO');
    expect(p.candidates.considered).toBe(6);
    const res = await designer.fetch('/api/match/proposals', {
      method: 'POST',
      json: { device_type: 'MT-CAS', shape: 'pair', count: 1, id_a: 1e-3, vds_v: 10, bins: ['NOPE'] },
    });
    expect(res.status).toBe(400);
    expect((await res.json()).error.message).toMatch(/No bin NOPE.*MTC-HI, MTC-LO/);
  });

  it('refuses requests it cannot answer, saying what to change', async () => {
    const bad = async (body: Record<string, unknown>) => {
      const res = await designer.fetch('/api/match/proposals', { method: 'POST', json: body });
      return { status: res.status, message: (await res.json()).error.message as string };
    };
    expect(await bad({ device_type: 'WS-N30', shape: 'pair', count: 5, vds_v: 10 })).toMatchObject({ status: 400, message: expect.stringMatching(/^The request is not valid — ID: /) });
    expect(await bad({ device_type: 'WS-N30', shape: 'cascode_pair', count: 1, operating_point: 'idss', vds_v: 10 })).toMatchObject({
      status: 400,
      message: expect.stringMatching(/cascode shares one drain current/),
    });
    expect(await bad({ device_type: 'NO-SUCH', shape: 'pair', count: 1, id_a: 1e-3, vds_v: 10 })).toMatchObject({
      status: 404,
      message: expect.stringMatching(/no device type "NO-SUCH".*WS-N30/),
    });
  });

  it('IDSS matching (VGS = 0) and self-bias operating points run', async () => {
    const idss = await propose({ device_type: 'WS-N30', shape: 'quad', count: 2, operating_point: 'idss', vds_v: 10, max_idss_mismatch: 0.05 });
    for (const s of idss.sets) {
      expect(s.idss_mismatch).toBeLessThanOrEqual(0.05);
      for (const x of s.parts) expect(x.vgs_v).toBe(0);
    }
    const sb = await propose({ device_type: 'WS-N30', shape: 'pair', count: 2, operating_point: 'self_bias', rs_ohm: 1000, vds_v: 10, max_dvgs_v: 0.01 });
    for (const x of sb.sets.flatMap((s) => s.parts)) expect(x.vgs_v).toBeCloseTo(-x.id_a * 1000, 12); // gate grounded: VGS = −ID·RS
  });

  it('only designers request matches; the exports of a proposed set name each card by serial', async () => {
    const body = { device_type: 'WS-N30', shape: 'pair', count: 1, id_a: 1e-3, vds_v: 10, max_dvgs_v: 0.01 };
    expect((await stores.fetch('/api/match/proposals', { method: 'POST', json: body })).status).toBe(403);
    expect((await inspector.fetch('/api/match/proposals', { method: 'POST', json: body })).status).toBe(403);
    const p = await propose(body);
    const cards = await (await designer.fetch(`/api/match/proposals/${p.id}/sets/1/model-cards`)).text();
    for (const part of p.sets[0]!.parts) expect(cards).toContain(`.model ${modelCardName(part.serial)} NJF(VTO=`);
    const csv = await (await designer.fetch(`/api/match/proposals/${p.id}/sets/1/figures.csv`)).text();
    expect(csv.trim().split('\r\n')).toHaveLength(3);
    expect(csv.split('\r\n')[0]).toMatch(/^set,role,cascode,serial,/);
    expect((await stores.fetch(`/api/match/proposals/${p.id}`)).status).toBe(403);
  });
});

describe('the candidate cache follows stock changes made anywhere', () => {
  // The server keeps each type's in-stock candidates in memory and drops them when PostgreSQL
  // announces a change (NOTIFY sluice_stock from a trigger on part, migration 0005). A change
  // made behind the app's back, straight in SQL, must reach the next proposal all the same.
  const ask = { device_type: 'WS-N30', shape: 'pair', count: 1, id_a: 0.001, vds_v: 10, max_dvgs_v: 0.01 };
  const inStock = async () => (await propose(ask)).candidates.in_stock;
  const settle = async (want: number) => {
    // A notice reaches the server a moment after the commit; allow it that moment.
    for (let i = 0; i < 40; i++) {
      const n = await inStock();
      if (n === want) return n;
      await new Promise((r) => setTimeout(r, 50));
    }
    return inStock();
  };

  it('a part taken out of stock and put back in SQL is counted out and in again', async () => {
    const before = await inStock();
    await inStock(); // the cache is built and current
    const [part] = await getDb()
      .select({ id: schema.part.id })
      .from(schema.part)
      .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
      .where(sql`${schema.deviceType.name} = 'WS-N30' AND ${schema.part.status} = 'in_stock'`)
      .limit(1);
    await getDb().execute(sql`UPDATE part SET status = 'quarantined' WHERE id = ${part!.id}`);
    expect(await settle(before - 1)).toBe(before - 1);
    await getDb().execute(sql`UPDATE part SET status = 'in_stock' WHERE id = ${part!.id}`);
    expect(await settle(before)).toBe(before);
  });

  it('a change to the type itself (its temperature coefficients) reaches the next proposal', async () => {
    const [type] = await getDb().select().from(schema.deviceType).where(eq(schema.deviceType.name, 'WS-N30'));
    const shiftAt = async () => (await propose({ ...ask, temperature_c: 35 })).sets[0]!.parts[0]!.temperature_shift_v;
    const first = await shiftAt();
    await getDb().execute(sql`UPDATE device_type SET vtotc_v_per_c = ${type!.vtotcVPerC * 2} WHERE id = ${type!.id}`);
    let later = await shiftAt();
    for (let i = 0; i < 40 && later === first; i++) {
      await new Promise((r) => setTimeout(r, 50));
      later = await shiftAt();
    }
    await getDb().execute(sql`UPDATE device_type SET vtotc_v_per_c = ${type!.vtotcVPerC} WHERE id = ${type!.id}`);
    expect(later).not.toBe(first);
  });

  it('only changes that touch stock are announced (parts in measurement or review are not)', async () => {
    const { default: pg } = await import('pg');
    const listener = new pg.Client({ connectionString: process.env.DATABASE_URL });
    await listener.connect();
    const heard: string[] = [];
    listener.on('notification', (n) => heard.push(n.payload ?? ''));
    await listener.query('LISTEN sluice_stock');
    try {
      const pick = async (status: string) =>
        (await getDb().execute<{ id: number; type: number }>(sql`SELECT id, device_type_id AS type FROM part WHERE status = ${status} LIMIT 1`)).rows[0];
      const outside = await pick('issued') ?? await pick('needs_review') ?? await pick('accepted');
      expect(outside, 'the demo has a part outside stock').toBeDefined();
      await getDb().execute(sql`UPDATE part SET updated_at = now() WHERE id = ${outside!.id}`);
      const inside = (await pick('in_stock'))!;
      await getDb().execute(sql`UPDATE part SET updated_at = now() WHERE id = ${inside.id}`);
      for (let i = 0; i < 40 && heard.length === 0; i++) await new Promise((r) => setTimeout(r, 50));
      await new Promise((r) => setTimeout(r, 250)); // room for a second notice, were one sent
      expect(heard).toEqual([String(inside.type)]);
    } finally {
      await listener.end();
    }
  });
});

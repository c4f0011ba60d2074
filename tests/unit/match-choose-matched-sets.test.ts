import { describe, expect, it } from 'vitest';
import { chooseMatchedSets } from '~/core/match/choose-matched-sets';
import { MatchRequestError } from '~/core/match/match-request-error';
import type {
  MatchCandidate,
  MatchResult,
  MatchShape,
  MatchTolerances,
  OperatingPoint,
} from '~/core/match/match-types';
import {
  gfsAtZeroVgsS,
  gmAtCurrentS,
  idssA,
  vgsAtCurrentV,
  type JfetParams,
} from '~/core/jfet-model';
import { seededRandom } from '~/core/random/seeded-random';

/**
 * The reference here is exhaustive enumeration (derived): every valid set is listed from the
 * raw model parameters with this file's own figure code, and every disjoint selection of them
 * is tried. Mismatch definitions as documented in the picker: ΔVGS = max − min, gm and IDSS as
 * 1 − min/max ("IDSS ratio ≥ 0.95" style grading, common practice); cost = Σ mismatch/tolerance.
 */

interface Fig {
  vgsV: number;
  gmS: number;
  idssA: number;
}

/** This file's own operating figures (RS = RD = 0 stocks), or null when not usable. */
function refFigures(p: JfetParams, op: OperatingPoint): Fig | null {
  const vds = op.vdsV;
  if (op.kind === 'idss') {
    if (vds < -p.vtoV) return null;
    return { vgsV: 0, gmS: gfsAtZeroVgsS(p, vds), idssA: idssA(p, vds) };
  }
  let id: number;
  let vgs: number;
  if (op.kind === 'current') {
    id = op.idA;
    vgs = vgsAtCurrentV(p, id, vds);
  } else {
    let lo = 0;
    let hi = idssA(p, vds);
    for (let i = 0; i < 200; i++) {
      const mid = (lo + hi) / 2;
      if (vgsAtCurrentV(p, mid, vds) + mid * op.rsOhm < 0) lo = mid;
      else hi = mid;
    }
    id = (lo + hi) / 2;
    vgs = -id * op.rsOhm;
  }
  if (vgs > 0 || vds < vgs - p.vtoV) return null;
  return { vgsV: vgs, gmS: gmAtCurrentS(p, id, vds), idssA: idssA(p, vds) };
}

const EPS = 1e-9;

function mismatch(f: Fig[]) {
  const v = f.map((x) => x.vgsV);
  const g = f.map((x) => x.gmS);
  const i = f.map((x) => x.idssA);
  return {
    dvgs: Math.max(...v) - Math.min(...v),
    gm: 1 - Math.min(...g) / Math.max(...g),
    idss: 1 - Math.min(...i) / Math.max(...i),
  };
}
const term = (m: number, t: number) => (t === Infinity || m <= 0 ? 0 : m / t);
/** Cost of a set, or null when it breaks a tolerance (EPS slack for float noise at the edge). */
function refCost(f: Fig[], tol: MatchTolerances): number | null {
  const m = mismatch(f);
  if (m.dvgs > tol.maxDvgsV * (1 + EPS) + 1e-15) return null;
  if (m.gm > tol.maxGmMismatch * (1 + EPS) + 1e-15) return null;
  if (m.idss > tol.maxIdssMismatch * (1 + EPS) + 1e-15) return null;
  return term(m.dvgs, tol.maxDvgsV) + term(m.gm, tol.maxGmMismatch) + term(m.idss, tol.maxIdssMismatch);
}

/** A cascode (lower l, upper u) at shared current idA: the lower's figures at VDS = −VGS(upper). */
function refCascode(l: JfetParams, u: JfetParams, idA: number, vdsV: number, marginV: number): Fig | null {
  const vgsU = vgsAtCurrentV(u, idA, vdsV);
  if (vgsU > 0 || vdsV < vgsU - u.vtoV) return null;
  const a = -vgsU;
  if (!(a > 0)) return null;
  const vgsL = vgsAtCurrentV(l, idA, a);
  if (vgsL > 0) return null;
  if (a < vgsL - l.vtoV + marginV - 1e-12) return null; // derived cascode condition
  return { vgsV: vgsL, gmS: gmAtCurrentS(l, idA, a), idssA: idssA(l, a) };
}

interface RefSet {
  members: number[];
  cost: number;
}

function combinations(n: number, k: number): number[][] {
  const out: number[][] = [];
  const rec = (start: number, acc: number[]) => {
    if (acc.length === k) return void out.push([...acc]);
    for (let i = start; i < n; i++) rec(i + 1, [...acc, i]);
  };
  rec(0, []);
  return out;
}

function refValidSets(
  cands: MatchCandidate[],
  shape: MatchShape,
  op: OperatingPoint,
  tol: MatchTolerances,
  sameLot: boolean,
): RefSet[] {
  const n = cands.length;
  const lotOk = (m: number[]) =>
    !sameLot || (cands[m[0]!]!.lotId !== null && m.every((i) => cands[i]!.lotId === cands[m[0]!]!.lotId));
  const out: RefSet[] = [];
  if (shape === 'pair' || shape === 'quad') {
    const figs = cands.map((c) => refFigures(c.params, op));
    for (const m of combinations(n, shape === 'pair' ? 2 : 4)) {
      if (!lotOk(m) || m.some((i) => figs[i] === null)) continue;
      const c = refCost(m.map((i) => figs[i]!), tol);
      if (c !== null) out.push({ members: m, cost: c });
    }
    return out;
  }
  const { idA, vdsV } = op as { idA: number; vdsV: number };
  const casc = (l: number, u: number) =>
    refCascode(cands[l]!.params, cands[u]!.params, idA, vdsV, tol.cascodeMarginV);
  if (shape === 'cascode_pair') {
    for (const m of combinations(n, 2)) {
      if (lotOk(m) && (casc(m[0]!, m[1]!) || casc(m[1]!, m[0]!))) out.push({ members: m, cost: 0 });
    }
    return out;
  }
  for (const m of combinations(n, 4)) {
    if (!lotOk(m)) continue;
    let best: number | null = null;
    for (const [x, y] of combinations(4, 2) as [number, number][]) {
      const rest = [0, 1, 2, 3].filter((t) => t !== x && t !== y);
      for (const [u0, u1] of [
        [rest[0]!, rest[1]!],
        [rest[1]!, rest[0]!],
      ]) {
        const c0 = casc(m[x]!, m[u0!]!);
        const c1 = casc(m[y]!, m[u1!]!);
        if (!c0 || !c1) continue;
        const c = refCost([c0, c1], tol);
        if (c !== null && (best === null || c < best)) best = c;
      }
    }
    if (best !== null) out.push({ members: m, cost: best });
  }
  return out;
}

/** Largest number of disjoint sets (≤ count), and the least total cost for that number. */
function bruteForce(sets: RefSet[], count: number): { count: number; cost: number } {
  const used = new Uint8Array(64);
  let best = { count: 0, cost: 0 };
  const dfs = (start: number, k: number, cost: number) => {
    if (k > best.count || (k === best.count && cost < best.cost)) best = { count: k, cost };
    if (k === count) return;
    for (let s = start; s < sets.length; s++) {
      const m = sets[s]!.members;
      if (m.some((i) => used[i])) continue;
      for (const i of m) used[i] = 1;
      dfs(s + 1, k + 1, cost + sets[s]!.cost);
      for (const i of m) used[i] = 0;
    }
  };
  dfs(0, 0, 0);
  return best;
}

/** Re-checks every returned set from the raw parameters; returns the total cost it finds. */
function recheck(
  r: MatchResult,
  cands: MatchCandidate[],
  shape: MatchShape,
  op: OperatingPoint,
  tol: MatchTolerances,
  sameLot: boolean,
): number {
  const byId = new Map(cands.map((c) => [c.id, c]));
  const ids = r.sets.flatMap((s) => s.parts.map((p) => p.id));
  expect(new Set(ids).size).toBe(ids.length); // disjoint
  for (const u of r.unusable) expect(ids).not.toContain(u.id);
  let total = 0;
  for (const s of r.sets) {
    const ps = s.parts.map((p) => byId.get(p.id)!);
    expect(ps).toHaveLength(shape === 'pair' || shape === 'cascode_pair' ? 2 : 4);
    if (sameLot) {
      expect(ps[0]!.lotId).not.toBeNull();
      for (const p of ps) expect(p.lotId).toBe(ps[0]!.lotId);
    }
    if (shape === 'pair' || shape === 'quad') {
      const f = ps.map((p) => refFigures(p.params, op));
      expect(f.every((x) => x !== null)).toBe(true);
      const c = refCost(f as Fig[], tol);
      expect(c).not.toBeNull();
      expect(s.costs.total).toBeCloseTo(c!, 9);
      total += c!;
      continue;
    }
    const { idA, vdsV } = op as { idA: number; vdsV: number };
    const lowers: Fig[] = [];
    for (const ci of shape === 'cascode_pair' ? [undefined] : [0, 1]) {
      const lo = s.parts.find((p) => p.role === 'lower' && p.cascodeIndex === ci)!;
      const up = s.parts.find((p) => p.role === 'upper' && p.cascodeIndex === ci)!;
      const f = refCascode(byId.get(lo.id)!.params, byId.get(up.id)!.params, idA, vdsV, tol.cascodeMarginV);
      expect(f).not.toBeNull();
      expect(lo.vgsV).toBeCloseTo(f!.vgsV, 9);
      lowers.push(f!);
    }
    if (shape === 'matched_cascode_pairs') {
      const c = refCost(lowers, tol);
      expect(c).not.toBeNull();
      total += c!;
    }
  }
  return total;
}

function randomStock(rand: () => number, n: number, lots: boolean): MatchCandidate[] {
  return Array.from({ length: n }, (_, i) => {
    // Now and then a part too weak for 1 mA, to exercise the unusable list.
    const idss = rand() < 0.08 ? 0.5e-3 + rand() * 0.4e-3 : 3e-3 + rand() * 4e-3;
    const vto = -1.5 - rand() * 1.5;
    return {
      id: `P${i}`,
      lotId: lots ? (rand() < 0.1 ? null : rand() < 0.5 ? 'A' : 'B') : null,
      binCode: null,
      params: { vtoV: vto, betaAPerV2: idss / (vto * vto), lambdaPerV: 0.005 + rand() * 0.015, rsOhm: 0, rdOhm: 0 },
    };
  });
}

function randomTolerances(rand: () => number, scale: number): MatchTolerances {
  const maybe = (x: number) => (rand() < 0.2 ? Infinity : x);
  return {
    maxDvgsV: maybe((0.05 + rand() * 0.25) * scale),
    maxGmMismatch: maybe((0.05 + rand() * 0.25) * scale),
    maxIdssMismatch: maybe((0.05 + rand() * 0.4) * scale),
    cascodeMarginV: rand() * 0.6,
  };
}

const OPS: OperatingPoint[] = [
  { kind: 'current', idA: 1e-3, vdsV: 10 },
  { kind: 'idss', vdsV: 10 },
  { kind: 'self_bias', rsOhm: 680, vdsV: 10 },
];

const looser = (t: MatchTolerances, f: number): MatchTolerances => ({
  maxDvgsV: t.maxDvgsV * f,
  maxGmMismatch: t.maxGmMismatch * f,
  maxIdssMismatch: t.maxIdssMismatch * f,
  cascodeMarginV: t.cascodeMarginV / f,
});

describe.each([
  { shape: 'pair' as const, seeds: 120, scale: 0.5, maxCount: 6 },
  { shape: 'quad' as const, seeds: 120, scale: 1.5, maxCount: 3 },
  { shape: 'cascode_pair' as const, seeds: 80, scale: 1, maxCount: 6 },
  { shape: 'matched_cascode_pairs' as const, seeds: 80, scale: 1.5, maxCount: 3 },
])('chooseMatchedSets($shape) against brute force on small stocks', ({ shape, seeds, scale, maxCount }) => {
  // MATCH_SEED_FACTOR=20 runs a longer soak of the same check.
  const runs = seeds * Number(process.env.MATCH_SEED_FACTOR ?? 1);
  it(`matches the exhaustive optimum on ${runs} random stocks of 8–12 parts`, () => {
    let nonTrivial = 0;
    for (let seed = 1; seed <= runs; seed++) {
      const rand = seededRandom(seed * 7919 + shape.length);
      const n = 8 + Math.floor(rand() * 5);
      const sameLot = rand() < 0.3;
      const cands = randomStock(rand, n, sameLot);
      const tol = randomTolerances(rand, scale);
      const op = shape.includes('cascode') ? OPS[0]! : OPS[seed % 3]!;
      const count = 1 + Math.floor(rand() * maxCount);
      const r = chooseMatchedSets({ candidates: cands, operatingPoint: op, shape, count, tolerances: tol, options: { sameLot } });
      const ref = bruteForce(refValidSets(cands, shape, op, tol, sameLot), count);
      const ctx = `seed ${seed}`;
      expect(r.guarantee.kind, ctx).toBe('exact');
      expect(r.sets.length, ctx).toBe(ref.count);
      const total = recheck(r, cands, shape, op, tol, sameLot);
      expect(total, ctx).toBeCloseTo(ref.cost, 9);
      expect(r.totalCost, ctx).toBeCloseTo(ref.cost, 9);
      const ref2 = bruteForce(refValidSets(cands, shape, op, looser(tol, 2), sameLot), count);
      expect(r.looser.allTimes2, ctx).toBe(ref2.count);
      if (ref.count > 0 && ref.cost > 0) nonTrivial++;
    }
    if (shape !== 'cascode_pair') expect(nonTrivial).toBeGreaterThan(runs / 4);
  });
});

describe('chooseMatchedSets on larger stocks', () => {
  it('pairs: 60-part stocks, count 1–2, the certificate path agrees with brute force', () => {
    for (let seed = 1; seed <= 25; seed++) {
      const rand = seededRandom(seed + 1000);
      const cands = randomStock(rand, 60, false);
      const tol: MatchTolerances = { maxDvgsV: 0.02, maxGmMismatch: 0.05, maxIdssMismatch: 0.1, cascodeMarginV: 0 };
      const op = OPS[seed % 3]!;
      const count = 1 + (seed % 2);
      const r = chooseMatchedSets({ candidates: cands, operatingPoint: op, shape: 'pair', count, tolerances: tol });
      const ref = bruteForce(refValidSets(cands, 'pair', op, tol, false), count);
      expect(r.guarantee.kind).toBe('exact');
      expect(r.sets.length).toBe(ref.count);
      expect(recheck(r, cands, 'pair', op, tol, false)).toBeCloseTo(ref.cost, 9);
    }
  });

  it('pairs and quads from 10 000 parts: exact, valid, and no dearer than cheapest-first', () => {
    const cands = randomStock(seededRandom(99), 10_000, false);
    const op: OperatingPoint = { kind: 'current', idA: 1e-3, vdsV: 10 };
    const tol: MatchTolerances = { maxDvgsV: 0.005, maxGmMismatch: 0.03, maxIdssMismatch: 0.05, cascodeMarginV: 0 };
    const figs = cands.map((c) => refFigures(c.params, op));
    const order = figs.map((_, i) => i).filter((i) => figs[i]).sort((a, b) => figs[a]!.vgsV - figs[b]!.vgsV);
    // Reference (derived): every valid pair by a sorted sweep, then cheapest-first disjoint.
    const pairs: RefSet[] = [];
    for (let x = 0; x < order.length; x++) {
      for (let y = x + 1; y < order.length && figs[order[y]!]!.vgsV - figs[order[x]!]!.vgsV <= tol.maxDvgsV; y++) {
        const c = refCost([figs[order[x]!]!, figs[order[y]!]!], tol);
        if (c !== null) pairs.push({ members: [order[x]!, order[y]!], cost: c });
      }
    }
    pairs.sort((a, b) => a.cost - b.cost);
    const used = new Set<number>();
    let greedy = 0;
    let taken = 0;
    for (const p of pairs) {
      if (taken === 50) break;
      if (p.members.some((i) => used.has(i))) continue;
      p.members.forEach((i) => used.add(i));
      greedy += p.cost;
      taken++;
    }
    const r = chooseMatchedSets({ candidates: cands, operatingPoint: op, shape: 'pair', count: 50, tolerances: tol });
    expect(r.guarantee.kind).toBe('exact');
    expect(r.sets).toHaveLength(50);
    const total = recheck(r, cands, 'pair', op, tol, false);
    expect(total).toBeLessThanOrEqual(greedy + 1e-12);
    // No pair costs less than the cheapest valid pair the sweep found.
    expect(Math.min(...r.sets.map((x) => x.costs.total))).toBeGreaterThanOrEqual(pairs[0]!.cost - 1e-12);

    const q = chooseMatchedSets({ candidates: cands, operatingPoint: op, shape: 'quad', count: 10, tolerances: { ...tol, maxGmMismatch: 0.06, maxIdssMismatch: 0.1 } });
    expect(q.sets).toHaveLength(10);
    recheck(q, cands, 'quad', op, { ...tol, maxGmMismatch: 0.06, maxIdssMismatch: 0.1 }, false);
  });

  it('matched cascodes beyond the exact limit: heuristic, but every set is valid', () => {
    const rand = seededRandom(42);
    const cands = randomStock(rand, 200, false);
    const tol: MatchTolerances = { maxDvgsV: 0.01, maxGmMismatch: 0.05, maxIdssMismatch: 0.2, cascodeMarginV: 0.2 };
    const op: OperatingPoint = { kind: 'current', idA: 1e-3, vdsV: 10 };
    const r = chooseMatchedSets({ candidates: cands, operatingPoint: op, shape: 'matched_cascode_pairs', count: 5, tolerances: tol });
    expect(r.guarantee.kind).toBe('heuristic');
    expect(r.sets.length).toBeGreaterThan(0);
    recheck(r, cands, 'matched_cascode_pairs', op, tol, false);
  });

  it('reports why parts are unusable and which tolerance binds', () => {
    const cands = randomStock(seededRandom(7), 40, false);
    const op: OperatingPoint = { kind: 'current', idA: 1e-3, vdsV: 10 };
    const tol: MatchTolerances = { maxDvgsV: 0.001, maxGmMismatch: Infinity, maxIdssMismatch: Infinity, cascodeMarginV: 0 };
    const r = chooseMatchedSets({ candidates: cands, operatingPoint: op, shape: 'pair', count: 10, tolerances: tol });
    const weak = cands.filter((c) => idssA(c.params, 10) < 1e-3).map((c) => c.id);
    expect(weak.length).toBeGreaterThan(0);
    expect(r.unusable.map((u) => u.id).sort()).toEqual(weak.sort());
    expect(r.unusable.every((u) => u.code === 'forward_gate')).toBe(true);
    // Only ΔVGS is constrained, so only loosening it can add sets (brute force at 2× ΔVGS).
    const ref2 = bruteForce(refValidSets(cands, 'pair', op, { ...tol, maxDvgsV: 0.002 }, false), 10);
    expect(r.looser.onlyOneTimes2.maxDvgsV).toBe(ref2.count);
    expect(r.looser.onlyOneTimes2.maxGmMismatch).toBe(r.sets.length);
  });

  it('a serial listed twice is never used twice', () => {
    const p: JfetParams = { vtoV: -2, betaAPerV2: 1.25e-3, lambdaPerV: 0.01, rsOhm: 0, rdOhm: 0 };
    const twin = { id: 'S1', lotId: null, binCode: null, params: p };
    const other = { id: 'S2', lotId: null, binCode: null, params: { ...p, vtoV: -2.001 } };
    const r = chooseMatchedSets({
      candidates: [twin, twin, other],
      operatingPoint: { kind: 'current', idA: 1e-3, vdsV: 10 },
      shape: 'pair',
      count: 1,
      tolerances: { maxDvgsV: 0.01, maxGmMismatch: Infinity, maxIdssMismatch: Infinity, cascodeMarginV: 0 },
    });
    expect(r.sets.map((s) => s.parts.map((x) => x.id).sort())).toEqual([['S1', 'S2']]);
    expect(r.unusable).toEqual([expect.objectContaining({ id: 'S1', code: 'duplicate_serial' })]);
  });

  it('cascode shapes refuse an operating point without a current', () => {
    expect(() =>
      chooseMatchedSets({
        candidates: [],
        operatingPoint: { kind: 'idss', vdsV: 10 },
        shape: 'cascode_pair',
        count: 1,
        tolerances: { maxDvgsV: 1, maxGmMismatch: 1, maxIdssMismatch: 1, cascodeMarginV: 0 },
      }),
    ).toThrow(MatchRequestError);
  });
});

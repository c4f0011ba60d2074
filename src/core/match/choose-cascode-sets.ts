import type { PartBasis } from '../operating-point/part-operating-figures';
import { evaluateAtOperatingPoint } from './evaluate-at-operating-point';
import type { MatchTolerances, OperatingFigures } from './match-types';
import { measureSetMismatch, meetsMatchTolerances, setCostFromMismatch } from './set-mismatch';
import { packDisjointSets, type CandidateSet, type PackingLimits } from './pack-disjoint-sets';

/** Usable parts for a cascode request: model, figures as an upper (at idA, vdsV), lot code. */
export interface CascodeStock {
  parts: readonly PartBasis[];
  /** Compare temperature (°C) for `partOperatingFigures`. */
  compareAtC?: number;
  upper: readonly OperatingFigures[];
  lotCode: Int32Array;
}

export interface CascodeMember {
  index: number;
  role: 'lower' | 'upper';
  cascodeIndex: 0 | 1;
  figures: OperatingFigures;
}

export interface CascodeSelection {
  sets: { members: CascodeMember[]; cost: number; headroomV: number }[];
  totalCost: number;
  exact: boolean;
  note: string;
}

/** Stocks up to this many usable parts are solved by full enumeration + exact packing. */
export const EXACT_CASCODE_PARTS = 14;

interface Cascode {
  lower: OperatingFigures;
  headroomV: number;
}

/**
 * Cascodes with the upper's gate tied to the lower's source, sharing the drain current `idA`.
 * Approximation (stated): the upper sits at the requested VDS (`vdsV`, its share of the supply)
 * and the lower at VDS = −VGS(upper); each part's VGS, gm and IDSS are taken at its own VDS.
 * A cascode is valid when −VGS(upper) ≥ VGS(lower) − VTO(lower) + margin (derived: the lower
 * must stay saturated), both parts in one lot when lots matter.
 *
 * `cascode_pair` has nothing to match: cost 0, so any selection of the largest size is optimal.
 * `matched_cascode_pairs` matches the two lowers to each other (ΔVGS, gm, IDSS at their own
 * VDS, cost as for pairs). The uppers are not matched to each other: an upper only sets its
 * lower's VDS, and the effect of a different upper VGS on the lower is already in the lower's
 * figures, which are taken at that VDS.
 *
 * Guarantees: up to EXACT_CASCODE_PARTS usable parts, every valid set is enumerated and packed
 * exactly (largest count, then least cost). Beyond that:
 * - cascode_pair: best-fit greedy (lowers by rising required headroom, each given the unused
 *   upper with the least sufficient −VGS). Exact whenever it reaches `count` (cost is 0);
 *   otherwise heuristic.
 * - matched_cascode_pairs: lower pairs are proposed from neighbours in VGS (taken at the
 *   median upper's −VGS), cheapest first, each given two best-fit uppers and then re-checked
 *   at the real VDS. Heuristic: every set meets every tolerance, the count may not be maximal.
 */
export function chooseCascodeSets(
  stock: CascodeStock,
  shape: 'cascode_pair' | 'matched_cascode_pairs',
  idA: number,
  count: number,
  tol: MatchTolerances,
  limits?: PackingLimits,
): CascodeSelection {
  const n = stock.upper.length;
  const aOf = (u: number) => -stock.upper[u]!.vgsV;
  const cascode = (l: number, u: number): Cascode | null => {
    if (l === u || stock.lotCode[l] !== stock.lotCode[u]) return null;
    const a = aOf(u);
    if (!(a > 0)) return null;
    const e = evaluateAtOperatingPoint(stock.parts[l]!, { kind: 'current', idA, vdsV: a }, stock.compareAtC);
    if (!e.usable) return null;
    const headroomV = a - e.figures.vdsSatV;
    return headroomV >= tol.cascodeMarginV ? { lower: e.figures, headroomV } : null;
  };
  const setSize = shape === 'cascode_pair' ? 2 : 4;
  if (count <= 0 || n < setSize) {
    return { sets: [], totalCost: 0, exact: true, note: 'not enough usable parts' };
  }

  if (n <= EXACT_CASCODE_PARTS) {
    const sets: CandidateSet[] = [];
    const built: CascodeSelection['sets'] = [];
    const push = (members: number[], best: CascodeSelection['sets'][number]) => {
      sets.push({ members, cost: best.cost });
      built.push(best);
    };
    if (shape === 'cascode_pair') {
      for (let i = 0; i < n; i++) {
        for (let j = i + 1; j < n; j++) {
          const options = [
            [i, j, cascode(i, j)],
            [j, i, cascode(j, i)],
          ] as const;
          let best: CascodeSelection['sets'][number] | null = null;
          for (const [l, u, c] of options) {
            if (c && (!best || c.headroomV > best.headroomV)) best = pairOf(l, u, c, stock, 0);
          }
          if (best) push([i, j], best);
        }
      }
    } else {
      for (let i = 0; i < n; i++)
        for (let j = i + 1; j < n; j++)
          for (let k = j + 1; k < n; k++)
            for (let l = k + 1; l < n; l++) {
              const lot = stock.lotCode[i];
              if (stock.lotCode[j] !== lot || stock.lotCode[k] !== lot || stock.lotCode[l] !== lot) continue;
              const best = bestMatchedCascodes([i, j, k, l], cascode, stock, tol);
              if (best) push([i, j, k, l], best);
            }
    }
    const packing = packDisjointSets(n, sets, Math.min(count, Math.floor(n / setSize)), limits);
    let found = packing.costByCount.length - 1;
    while (found > 0 && packing.costByCount[found] === Infinity) found--;
    const chosen = packing.pick(found).map((idx) => built[idx]!);
    return {
      sets: chosen,
      totalCost: packing.costByCount[found]!,
      exact: packing.exact,
      note: packing.exact ? '' : 'exact search limit reached: packed greedily',
    };
  }

  const used = new Uint8Array(n);
  const uppers = bestFitUppers(stock, aOf);
  if (shape === 'cascode_pair') {
    const required = requiredHeadroom(stock, idA, tol.cascodeMarginV);
    const lowersOrder = [...Array(n).keys()].sort((x, y) => required[x]! - required[y]!);
    const sets: CascodeSelection['sets'] = [];
    for (const l of lowersOrder) {
      if (sets.length === count) break;
      if (used[l]) continue;
      const found = uppers.take(required[l]!, (u) => !used[u] && cascode(l, u));
      if (found === null) continue;
      used[l] = used[found.u] = 1;
      sets.push(pairOf(l, found.u, found.c, stock, 0));
    }
    const exact = sets.length === count;
    return {
      sets,
      totalCost: 0,
      exact,
      note: exact ? '' : `more than ${EXACT_CASCODE_PARTS} parts: best-fit greedy`,
    };
  }

  // matched_cascode_pairs, large stock.
  const aSorted = Float64Array.from(stock.upper, (f) => -f.vgsV).sort();
  const nominalVdsV = Math.max(aSorted[n >> 1]!, 1e-3);
  const nominal = stock.parts.map((p) =>
    evaluateAtOperatingPoint(p, { kind: 'current', idA, vdsV: nominalVdsV }, stock.compareAtC),
  );
  const byVgs = [...Array(n).keys()]
    .filter((i) => nominal[i]!.usable)
    .sort((x, y) => vgsOf(nominal[x]!) - vgsOf(nominal[y]!));
  const proposals: { x: number; y: number; cost: number }[] = [];
  const NEIGHBOURS = 12;
  for (let r = 0; r < byVgs.length; r++) {
    for (let t = r + 1; t < byVgs.length && t <= r + NEIGHBOURS; t++) {
      const x = byVgs[r]!;
      const y = byVgs[t]!;
      if (vgsOf(nominal[y]!) - vgsOf(nominal[x]!) > tol.maxDvgsV) break;
      if (stock.lotCode[x] !== stock.lotCode[y]) continue;
      const m = measureSetMismatch([figOf(nominal[x]!), figOf(nominal[y]!)]);
      if (meetsMatchTolerances(m, tol)) {
        proposals.push({ x, y, cost: setCostFromMismatch(m, tol).total });
      }
    }
  }
  proposals.sort((p, q) => p.cost - q.cost);
  const required = requiredHeadroom(stock, idA, tol.cascodeMarginV);
  const sets: CascodeSelection['sets'] = [];
  for (const { x, y } of proposals) {
    if (sets.length === count) break;
    if (used[x] || used[y]) continue;
    used[x] = used[y] = 1;
    const ux = uppers.take(required[x]!, (u) => !used[u] && cascode(x, u));
    if (ux) used[ux.u] = 1;
    const uy = ux && uppers.take(required[y]!, (u) => !used[u] && cascode(y, u));
    const m = ux && uy && measureSetMismatch([ux.c.lower, uy.c.lower]);
    if (ux && uy && m && meetsMatchTolerances(m, tol)) {
      used[uy.u] = 1;
      sets.push(matchedOf(x, ux.u, ux.c, y, uy.u, uy.c, stock, setCostFromMismatch(m, tol).total));
      continue;
    }
    used[x] = used[y] = 0;
    if (ux) {
      used[ux.u] = 0;
      uppers.release(ux.u);
    }
    if (uy) uppers.release(uy.u);
  }
  return {
    sets,
    totalCost: sets.reduce((s, x) => s + x.cost, 0),
    exact: false,
    note: `more than ${EXACT_CASCODE_PARTS} parts: greedy over neighbouring lower pairs`,
  };
}

const vgsOf = (e: ReturnType<typeof evaluateAtOperatingPoint>) => (e.usable ? e.figures.vgsV : NaN);
const figOf = (e: ReturnType<typeof evaluateAtOperatingPoint>) => (e as { figures: OperatingFigures }).figures;

function pairOf(l: number, u: number, c: Cascode, stock: CascodeStock, ci: 0 | 1) {
  return {
    members: [
      { index: l, role: 'lower', cascodeIndex: ci, figures: c.lower },
      { index: u, role: 'upper', cascodeIndex: ci, figures: stock.upper[u]! },
    ] satisfies CascodeMember[],
    cost: 0,
    headroomV: c.headroomV,
  };
}

function matchedOf(
  l0: number, u0: number, c0: Cascode,
  l1: number, u1: number, c1: Cascode,
  stock: CascodeStock,
  cost: number,
) {
  const a = pairOf(l0, u0, c0, stock, 0);
  const b = pairOf(l1, u1, c1, stock, 1);
  return {
    members: [...a.members, ...b.members],
    cost,
    headroomV: Math.min(c0.headroomV, c1.headroomV),
  };
}

/** Least-cost valid role assignment of four parts as two matched cascodes, or null. */
function bestMatchedCascodes(
  four: number[],
  cascode: (l: number, u: number) => Cascode | null,
  stock: CascodeStock,
  tol: MatchTolerances,
) {
  let best: ReturnType<typeof matchedOf> | null = null;
  for (let x = 0; x < 4; x++) {
    for (let y = x + 1; y < 4; y++) {
      const [l0, l1] = [four[x]!, four[y]!];
      const rest = four.filter((_, t) => t !== x && t !== y);
      for (const [u0, u1] of [
        [rest[0]!, rest[1]!],
        [rest[1]!, rest[0]!],
      ]) {
        const c0 = cascode(l0, u0!);
        const c1 = c0 && cascode(l1, u1!);
        if (!c0 || !c1) continue;
        const m = measureSetMismatch([c0.lower, c1.lower]);
        if (!meetsMatchTolerances(m, tol)) continue;
        const cost = setCostFromMismatch(m, tol).total;
        if (!best || cost < best.cost) best = matchedOf(l0, u0!, c0, l1, u1!, c1, stock, cost);
      }
    }
  }
  return best;
}

/**
 * Per part, the least −VGS(upper) that keeps it saturated with the margin as a lower: the fixed
 * point of a = VDS(sat)(at VDS = a) + margin (VDS(sat) falls slowly as VDS rises through λ).
 */
function requiredHeadroom(stock: CascodeStock, idA: number, marginV: number): Float64Array {
  return Float64Array.from(stock.parts, (p) => {
    let a = Math.max(-p.params.vtoV, 1e-3);
    for (let it = 0; it < 6; it++) {
      const e = evaluateAtOperatingPoint(p, { kind: 'current', idA, vdsV: a }, stock.compareAtC);
      const sat = e.usable ? e.figures.vdsSatV : -p.params.vtoV;
      a = Math.max(sat + marginV, 1e-3);
    }
    return a;
  });
}

/** Uppers by rising −VGS; `take(min, ok)` returns the first not yet taken with −VGS ≥ min. */
function bestFitUppers(stock: CascodeStock, aOf: (u: number) => number) {
  const order = [...Array(stock.upper.length).keys()].sort((x, y) => aOf(x) - aOf(y));
  const a = Float64Array.from(order, aOf);
  const taken = new Uint8Array(order.length);
  const posOf = new Int32Array(order.length);
  order.forEach((u, r) => (posOf[u] = r));
  return {
    take(minA: number, ok: (u: number) => Cascode | null | false) {
      let lo = 0;
      let hi = a.length;
      const from = minA - 1e-9;
      while (lo < hi) {
        const mid = (lo + hi) >> 1;
        if (a[mid]! < from) lo = mid + 1;
        else hi = mid;
      }
      for (let r = lo; r < a.length; r++) {
        if (taken[r]) continue;
        const c = ok(order[r]!);
        if (c) {
          taken[r] = 1;
          return { u: order[r]!, c };
        }
      }
      return null;
    },
    release(u: number) {
      taken[posOf[u]!] = 0;
    },
  };
}

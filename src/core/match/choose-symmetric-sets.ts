import type { MatchTolerances } from './match-types';
import { DVGS_GUARD_SIGMAS } from './set-mismatch';
import { packDisjointSets, type CandidateSet, type PackingLimits } from './pack-disjoint-sets';
import { float64Scratch, int32Scratch, uint32Scratch } from './scratch';

/** Figures of the usable parts, one entry per part (typed arrays for large stocks). */
export interface SymmetricStock {
  vgsV: Float64Array;
  gmS: Float64Array;
  idssA: Float64Array;
  /** Parts may share a set only when their codes are equal (all 0 when lots don't matter). */
  lotCode: Int32Array;
  /**
   * One standard deviation of each VGS (V). A set's ΔVGS counts as ΔVGS + 2·σ(ΔVGS), σ of its
   * highest and lowest members combined (`DVGS_GUARD_SIGMAS`); absent means all 0.
   */
  vgsSigmaV?: Float64Array;
}

export interface SymmetricSelection {
  /** Each set as indices into the stock arrays. */
  sets: number[][];
  totalCost: number;
  exact: boolean;
  note: string;
}

const MAX_SET_COST = 3;

// Working arrays, reused across requests (see scratch.ts).
const keyScratch = float64Scratch();
const vScratch = float64Scratch();
const gScratch = float64Scratch();
const iScratch = float64Scratch();
const sScratch = float64Scratch();
const kScratch = float64Scratch();
const shrinkScratch = float64Scratch();
const qScratch = float64Scratch();
const lotScratch = int32Scratch();
const parentScratch = int32Scratch();
const localScratch = int32Scratch();
const thetaScratch = float64Scratch();
const sortIdx = [uint32Scratch(), uint32Scratch()];
const sortQ = [uint32Scratch(), uint32Scratch()];
const sortCounts = new Uint32Array(65536);
const QUAD_CANDIDATE_CAP = 400_000;

/**
 * Up to `count` disjoint pairs (setSize 2) or quads (setSize 4), all within `tol`: the largest
 * number possible, and among those the least total cost Σ (ΔVGS/maxΔVGS + gm/maxGm +
 * IDSS/maxIdss), every mismatch over the whole set (`measureSetMismatch` definitions).
 *
 * Why it is exact (where it says so):
 * 1. Locality. Parts are sorted once by a key that bounds the cost: VGS (a set of cost ≤ θ has
 *    ΔVGS ≤ min(θ,1)·maxΔVGS), or ln IDSS / ln gm when VGS is not matched (1 − min/max ≤ x
 *    ⇔ Δln ≤ −ln(1 − x)). So every set of cost ≤ θ lies inside a key window and is found by
 *    scanning near neighbours only.
 * 2. Threshold restriction. Let S_θ be all valid sets of cost ≤ θ (complete, by 1.). Split the
 *    parts they touch into connected components; solve each component exactly for every k
 *    (`packDisjointSets`); merge components with a min-plus table capped at `count` — exact,
 *    since components share no part. Components are merged cheapest-set first, and merging
 *    stops once a component whose cheapest set costs μ cannot improve the best total for
 *    `count` (k of its sets add ≥ k·μ; later components are dearer still). This is the optimum
 *    over S_θ.
 * 3. Certificate. Give each part v the bound q_v = least cost of a set in S_θ containing it
 *    (θ if none: any set containing it then costs more than θ). A set costs at least the mean
 *    of its members' q_v, so any k disjoint sets cost at least LB_k = (1/size)·Σ of the
 *    size·k smallest q_v. A selection of `count` sets that uses any set outside S_θ costs
 *    > θ + LB_{count−1}. Hence if the S_θ optimum has `count` sets and total C ≤ θ + LB_{count−1},
 *    it is the global optimum. Otherwise θ grows (to at least C − LB) and 1–3 repeat; at
 *    θ = 3 (no valid set costs more) S_θ is every valid set, so fewer than `count` sets found
 *    there is the true maximum with its true least cost.
 * The guarantee is exact unless a component exceeds the exact search limits (or the quad
 * candidate cap); then that component is packed greedily and the result is marked heuristic.
 * For a large dense stock the certificate holds at a tiny θ: S_θ is a few hundred near-identical
 * pairs, so a 100 000-part request touches only the sort and one short neighbour scan.
 */
export function chooseSymmetricSets(
  stock: SymmetricStock,
  setSize: 2 | 4,
  requested: number,
  tol: MatchTolerances,
  matchVgs: boolean,
  limits?: PackingLimits,
): SymmetricSelection {
  const n = stock.vgsV.length;
  const count = Math.min(requested, Math.floor(n / setSize));
  const empty: SymmetricSelection = { sets: [], totalCost: 0, exact: true, note: '' };
  if (count <= 0 || n < setSize) return { ...empty, note: 'not enough usable parts' };
  // For the idss operating point every VGS is 0: ΔVGS is then no constraint and no cost.
  const maxDvgsV = matchVgs ? tol.maxDvgsV : Infinity;

  const ratioGap = (x: number) => (x >= 1 ? Infinity : -Math.log1p(-x));
  let key: Float64Array;
  let gapForTheta: (theta: number) => number;
  if (maxDvgsV < Infinity) {
    key = stock.vgsV;
    gapForTheta = (t) => Math.min(t, 1) * maxDvgsV;
  } else if (tol.maxIdssMismatch < Infinity) {
    key = logOf(stock.idssA, keyScratch.take(n));
    gapForTheta = (t) => ratioGap(Math.min(t, 1) * tol.maxIdssMismatch);
  } else if (tol.maxGmMismatch < Infinity) {
    key = logOf(stock.gmS, keyScratch.take(n));
    gapForTheta = (t) => ratioGap(Math.min(t, 1) * tol.maxGmMismatch);
  } else {
    return takeAnyByLot(stock.lotCode, setSize, count);
  }

  const order = sortIndicesByKey(key, true);
  const { maxGmMismatch: maxG, maxIdssMismatch: maxI } = tol;
  // Only what a tolerance constrains is gathered and read: an unconstrained figure adds nothing
  // to any cost, and one lot for all needs no lot check. (Gathering in key order is random
  // access over the stock, the dearest part of a large request.)
  let lotsDiffer = false;
  for (let i = 1; i < n && !lotsDiffer; i++) lotsDiffer = stock.lotCode[i] !== stock.lotCode[0];
  const V = vScratch.take(n);
  const S = sScratch.take(n);
  const K = key === stock.vgsV ? V : kScratch.take(n);
  const G = maxG < Infinity ? gScratch.take(n) : null;
  const I = maxI < Infinity ? iScratch.take(n) : null;
  const L = lotsDiffer ? lotScratch.take(n) : null;
  const sigma = stock.vgsSigmaV;
  for (let r = 0; r < n; r++) {
    const o = order[r]!;
    V[r] = stock.vgsV[o]!;
    S[r] = sigma ? sigma[o]! : 0;
    if (K !== V) K[r] = key[o]!;
    if (G) G[r] = stock.gmS[o]!;
    if (I) I[r] = stock.idssA[o]!;
    if (L) L[r] = stock.lotCode[o]!;
  }
  // The guard only ever adds to ΔVGS, so a set of cost ≤ θ still lies inside the VGS window.
  const guard = matchVgs ? DVGS_GUARD_SIGMAS : 0;
  // And it narrows the window: a pair (i, j) has guarded ΔVGS ≥ |V_j − V_i| + guard·σ_i, so
  // with VGS as the key, part i's partners lie within gap − guard·σ_i of it.
  let shrink: Float64Array | null = null;
  if (guard > 0 && key === stock.vgsV) {
    shrink = shrinkScratch.take(n);
    for (let r = 0; r < n; r++) shrink[r] = guard * S[r]!;
  }
  const term = (m: number, t: number) => (t === Infinity || m <= 0 ? 0 : t > 0 ? m / t : Infinity);

  /** Cost of the set of sorted positions `m`, or Infinity when it is not valid. */
  const setCost = (m: readonly number[]): number => {
    let vMin = Infinity, vMax = -Infinity, gMin = Infinity, gMax = -Infinity;
    let iMin = Infinity, iMax = -Infinity;
    const lot = L ? L[m[0]!] : 0;
    for (const r of m) {
      if (L && L[r] !== lot) return Infinity;
      const v = V[r]!;
      if (v < vMin) vMin = v;
      if (v > vMax) vMax = v;
      if (G) {
        const g = G[r]!;
        if (g < gMin) gMin = g;
        if (g > gMax) gMax = g;
      }
      if (I) {
        const i = I[r]!;
        if (i < iMin) iMin = i;
        if (i > iMax) iMax = i;
      }
    }
    let dv = vMax - vMin;
    if (guard > 0) {
      // The guarded ΔVGS of a set is that of its worst pair, so a set qualifies exactly when every pair in it does.
      dv = 0;
      for (let a = 0; a < m.length; a++)
        for (let b = a + 1; b < m.length; b++) {
          const x = m[a]!, y = m[b]!;
          dv = Math.max(dv, Math.abs(V[x]! - V[y]!) + guard * Math.sqrt(S[x]! * S[x]! + S[y]! * S[y]!));
        }
    }
    const dg = G ? 1 - gMin / gMax : 0;
    const di = I ? 1 - iMin / iMax : 0;
    if (!(dv <= maxDvgsV && dg <= maxG && di <= maxI)) return Infinity;
    return term(dv, maxDvgsV) + term(dg, maxG) + term(di, maxI);
  };

  /** Cost of the pair at sorted positions i < j, or Infinity when it is not valid. */
  const pairCost = (i: number, j: number): number => {
    if (L && L[i] !== L[j]) return Infinity;
    const dv = Math.abs(V[j]! - V[i]!) + guard * Math.sqrt(S[i]! * S[i]! + S[j]! * S[j]!);
    let dg = 0;
    let di = 0;
    if (G) {
      const g0 = G[i]!, g1 = G[j]!;
      dg = g0 < g1 ? 1 - g0 / g1 : 1 - g1 / g0;
    }
    if (I) {
      const i0 = I[i]!, i1 = I[j]!;
      di = i0 < i1 ? 1 - i0 / i1 : 1 - i1 / i0;
    }
    if (!(dv <= maxDvgsV && dg <= maxG && di <= maxI)) return Infinity;
    return term(dv, maxDvgsV) + term(dg, maxG) + term(di, maxI);
  };

  let theta = initialTheta(n, setSize, count, setCost, pairCost);
  const q = qScratch.take(n);
  const parent = parentScratch.take(n, -1);
  const local = localScratch.take(n);
  const find = (x: number): number => {
    let r = x;
    while (parent[r] !== r) r = parent[r]!;
    while (parent[x] !== r) {
      const nx = parent[x]!;
      parent[x] = r;
      x = nx;
    }
    return r;
  };
  for (;;) {
    const full = theta >= MAX_SET_COST;
    const gap = full ? gapForTheta(Infinity) : gapForTheta(theta) * (1 + 1e-12) + 1e-15;
    const costCap = full ? Infinity : theta;
    const flat = new FlatSets(setSize);
    const capped =
      setSize === 2
        ? scanPairs(K, gap, shrink, costCap, pairCost, flat)
        : scanQuads(K, gap, shrink, costCap, pairCost, setCost, flat);
    const setCount = flat.size;
    const members = flat.members;
    const costs = flat.costs;

    // Components over the parts the candidate sets touch; q_v as in step 3 above.
    const touched: number[] = [];
    for (let s = 0; s < setCount; s++) {
      const base = s * setSize;
      for (let t = 0; t < setSize; t++) {
        const v = members[base + t]!;
        if (parent[v] === -1) {
          parent[v] = v;
          q[v] = theta;
          touched.push(v);
        }
        if (costs[s]! < q[v]!) q[v] = costs[s]!;
      }
      const r0 = find(members[base]!);
      for (let t = 1; t < setSize; t++) {
        const r = find(members[base + t]!);
        if (r !== r0) parent[r] = r0;
      }
    }
    // Group sets by component root (counting sort) and rank components by their cheapest set.
    const compIndex = new Map<number, number>();
    const compOfSet = new Int32Array(setCount);
    const cheapest: number[] = [];
    for (let s = 0; s < setCount; s++) {
      const r = find(members[s * setSize]!);
      let ci = compIndex.get(r);
      if (ci === undefined) {
        ci = cheapest.length;
        compIndex.set(r, ci);
        cheapest.push(Infinity);
      }
      compOfSet[s] = ci;
      if (costs[s]! < cheapest[ci]!) cheapest[ci] = costs[s]!;
    }
    const compCount = cheapest.length;
    const start = new Int32Array(compCount + 1);
    for (let s = 0; s < setCount; s++) start[compOfSet[s]! + 1]!++;
    for (let c = 0; c < compCount; c++) start[c + 1]! += start[c]!;
    const setsByComp = new Int32Array(setCount);
    const fill = start.slice(0, compCount);
    for (let s = 0; s < setCount; s++) setsByComp[fill[compOfSet[s]!]!++] = s;
    const compOrder = sortIndicesByKey(Float64Array.from(cheapest));

    let allExact = !capped;
    let largestInexact = 0;
    const solved: { sets: number[][]; packing: ReturnType<typeof packDisjointSets> }[] = [];
    const choice: Int32Array[] = [];
    let dp = new Float64Array(count + 1).fill(Infinity);
    dp[0] = 0;
    for (const ci of compOrder) {
      // A component whose cheapest set costs μ adds ≥ k·μ for k sets: once that cannot beat
      // the best `count` so far, no later (dearer) component can either.
      if (dp[count]! < Infinity) {
        let canImprove = false;
        for (let k = 1; k <= count && !canImprove; k++) {
          canImprove = dp[count - k]! + k * cheapest[ci]! < dp[count]!;
        }
        if (!canImprove) break;
      }
      const compSets: number[][] = [];
      const vertices: number[] = [];
      for (let t = start[ci]!; t < start[ci + 1]!; t++) {
        const s = setsByComp[t]!;
        const m = Array.from(members.subarray(s * setSize, (s + 1) * setSize));
        compSets.push(m);
        for (const v of m) if (parent[v] !== -2 - ci) (parent[v] = -2 - ci), vertices.push(v);
      }
      vertices.sort((x, y) => x - y);
      vertices.forEach((v, li) => (local[v] = li));
      const localSets: CandidateSet[] = compSets.map((m, t) => ({
        members: m.map((v) => local[v]!),
        cost: costs[setsByComp[start[ci]! + t]!]!,
      }));
      const maxK = Math.min(count, Math.floor(vertices.length / setSize));
      const packing = packDisjointSets(vertices.length, localSets, maxK, limits);
      if (!packing.exact) {
        allExact = false;
        largestInexact = Math.max(largestInexact, vertices.length);
      }
      solved.push({ sets: compSets, packing });
      const next = dp.slice();
      const pick = new Int32Array(count + 1);
      for (let j = 0; j <= count; j++) {
        if (dp[j] === Infinity) continue;
        for (let k = 1; k < packing.costByCount.length && j + k <= count; k++) {
          const v = dp[j]! + packing.costByCount[k]!;
          if (v < next[j + k]!) {
            next[j + k] = v;
            pick[j + k] = k;
          }
        }
      }
      choice.push(pick);
      dp = next;
    }
    let found = count;
    while (found > 0 && dp[found] === Infinity) found--;
    const total = dp[found]!;

    let certified = full;
    if (!full && found === count) {
      let nb = 0;
      const bounds = new Float64Array(touched.length);
      for (const v of touched) if (q[v]! < theta) bounds[nb++] = q[v]!;
      const sortedBounds = bounds.subarray(0, nb).sort();
      const need = setSize * (count - 1);
      let lb = 0;
      for (let t = 0; t < need; t++) lb += t < nb ? sortedBounds[t]! : theta;
      lb /= setSize;
      certified = total <= theta + lb + 1e-12 * (1 + total);
      if (!certified) theta = Math.max(theta * 1.5, total - lb);
    }
    for (const v of touched) parent[v] = -1;
    if (certified || (!allExact && found === count)) {
      const out: number[][] = [];
      let j = found;
      for (let c = solved.length - 1; c >= 0; c--) {
        const k = choice[c]![j]!;
        if (k === 0) continue;
        for (const idx of solved[c]!.packing.pick(k)) out.push(solved[c]!.sets[idx]!);
        j -= k;
      }
      const note = allExact
        ? ''
        : capped
          ? `more than ${QUAD_CANDIDATE_CAP} candidate quads: packed greedily`
          : `a component of ${largestInexact} parts exceeded the exact search: packed greedily`;
      return {
        sets: out.map((m) => m.map((r) => order[r]!)),
        totalCost: total,
        exact: allExact,
        note,
      };
    }
    if (found < count) theta = Math.max(theta * 2, 1e-9);
    theta = Math.min(theta, MAX_SET_COST);
  }
}

/** Candidate sets of one size, members (sorted positions, ascending) and costs in flat arrays. */
class FlatSets {
  members: Int32Array;
  costs: Float64Array;
  size = 0;
  constructor(readonly setSize: number) {
    this.costs = new Float64Array(256);
    this.members = new Int32Array(256 * setSize);
  }
  push(m: readonly number[], cost: number) {
    if (this.size === this.costs.length) {
      const mm = new Int32Array(this.members.length * 2);
      mm.set(this.members);
      this.members = mm;
      const cc = new Float64Array(this.costs.length * 2);
      cc.set(this.costs);
      this.costs = cc;
    }
    this.members.set(m, this.size * this.setSize);
    this.costs[this.size++] = cost;
  }
}

/**
 * A first θ from sets of consecutive parts (in key order). Pairs: the count-th cheapest valid
 * adjacent pair, usually enough for the certificate in one or two passes. Quads: the cheapest consecutive
 * quad, since a high first θ lets components grow past the exact search while starting low costs
 * only a few cheap passes.
 */
function initialTheta(
  n: number,
  setSize: number,
  count: number,
  setCost: (m: number[]) => number,
  pairCost: (i: number, j: number) => number,
): number {
  const all = thetaScratch.take(Math.max(n - setSize + 1, 0));
  let found = 0;
  const m = new Array<number>(setSize);
  for (let r = 0; r + setSize <= n; r++) {
    let c: number;
    if (setSize === 2) c = pairCost(r, r + 1);
    else {
      for (let t = 0; t < setSize; t++) m[t] = r + t;
      c = setCost(m);
    }
    if (c < Infinity) all[found++] = c;
  }
  if (found === 0) return 0.01;
  const costs = all.subarray(0, found);
  const want = setSize === 2 ? Math.min(found, 4 * count) - 1 : 0;
  return Math.max(quickSelect(costs, want), 1e-9);
}

function logOf(x: Float64Array, out: Float64Array): Float64Array {
  for (let i = 0; i < x.length; i++) out[i] = Math.log(x[i]!);
  return out;
}

function quickSelect(a: Float64Array, k: number): number {
  let lo = 0;
  let hi = a.length - 1;
  while (lo < hi) {
    const pivot = a[(lo + hi) >> 1]!;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i]! < pivot) i++;
      while (a[j]! > pivot) j--;
      if (i <= j) {
        const t = a[i]!;
        a[i] = a[j]!;
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return a[k]!;
}

/**
 * Every valid pair of cost ≤ costCap whose key gap is ≤ gap (less `shrink[i]` for pairs that
 * start at sorted position i, when given); returns false (never capped).
 */
function scanPairs(
  K: Float64Array,
  gap: number,
  shrink: Float64Array | null,
  costCap: number,
  pairCost: (i: number, j: number) => number,
  out: FlatSets,
): boolean {
  const n = K.length;
  const m = [0, 0];
  for (let i = 0; i < n; i++) {
    const reach = shrink ? gap - shrink[i]! : gap;
    if (reach < 0) continue;
    const limit = K[i]! + reach;
    for (let j = i + 1; j < n && K[j]! <= limit; j++) {
      const c = pairCost(i, j);
      if (c <= costCap) {
        m[0] = i;
        m[1] = j;
        out.push(m, c);
      }
    }
  }
  return false;
}

/** Every valid quad of cost ≤ costCap; true when QUAD_CANDIDATE_CAP cut the list short. */
function scanQuads(
  K: Float64Array,
  gap: number,
  shrink: Float64Array | null,
  costCap: number,
  pairCost: (i: number, j: number) => number,
  setCost: (m: readonly number[]) => number,
  out: FlatSets,
): boolean {
  // Every pair inside a quad of cost ≤ θ also costs ≤ θ, so quads are 4-cliques of that graph.
  const pairs = new FlatSets(2);
  scanPairs(K, gap, shrink, costCap, pairCost, pairs);
  const n = K.length;
  const after = new Map<number, number[]>();
  const isEdge = new Set<number>();
  for (let p = 0; p < pairs.size; p++) {
    const i = pairs.members[2 * p]!;
    const j = pairs.members[2 * p + 1]!;
    let list = after.get(i);
    if (!list) after.set(i, (list = []));
    list.push(j);
    isEdge.add(i * n + j);
  }
  const m = [0, 0, 0, 0];
  for (const [i, nb] of after) {
    for (let a = 0; a < nb.length; a++) {
      for (let b = a + 1; b < nb.length; b++) {
        if (!isEdge.has(nb[a]! * n + nb[b]!)) continue;
        for (let c = b + 1; c < nb.length; c++) {
          if (!isEdge.has(nb[a]! * n + nb[c]!) || !isEdge.has(nb[b]! * n + nb[c]!)) continue;
          m[0] = i;
          m[1] = nb[a]!;
          m[2] = nb[b]!;
          m[3] = nb[c]!;
          const cost = setCost(m);
          if (cost > costCap) continue;
          out.push(m, cost);
          if (out.size >= QUAD_CANDIDATE_CAP) return true;
        }
      }
    }
  }
  return false;
}

/**
 * Sorted positions → original indices, ascending key. Two 16-bit radix passes on a monotone
 * 32-bit quantisation of the key (the quantised value travels with the index), then an insertion
 * pass on the exact key, which only ever moves parts that share a quantum; several times faster
 * than a comparator sort on 10⁵ parts.
 */
function sortIndicesByKey(key: Float64Array, reuse = false): Uint32Array {
  const n = key.length;
  if (n < 1024) {
    const small = new Uint32Array(n);
    for (let i = 0; i < n; i++) small[i] = i;
    return small.sort((a, b) => key[a]! - key[b]! || a - b);
  }
  // `reuse`: into the shared working arrays (the part order); else into fresh ones, which the
  // caller may keep beside the part order (the component order).
  const u32 = (k: number) => (reuse ? sortIdx[k]!.take(n) : new Uint32Array(n));
  const q32 = (k: number) => (reuse ? sortQ[k]!.take(n) : new Uint32Array(n));
  let idx = u32(0);
  for (let i = 0; i < n; i++) idx[i] = i;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < n; i++) {
    if (key[i]! < min) min = key[i]!;
    if (key[i]! > max) max = key[i]!;
  }
  if (!(max > min) || !Number.isFinite(max - min)) {
    idx.sort((a, b) => key[a]! - key[b]! || a - b);
    return idx;
  }
  const scale = 4294967295 / (max - min);
  let q = q32(0);
  for (let i = 0; i < n; i++) q[i] = Math.min(4294967295, Math.floor((key[i]! - min) * scale));
  let idx2 = u32(1);
  let q2 = q32(1);
  const counts = sortCounts;
  for (const shift of [0, 16]) {
    counts.fill(0);
    for (let r = 0; r < n; r++) counts[(q[r]! >>> shift) & 0xffff]!++;
    let sum = 0;
    for (let b = 0; b < 65536; b++) {
      const c = counts[b]!;
      counts[b] = sum;
      sum += c;
    }
    for (let r = 0; r < n; r++) {
      const d = counts[(q[r]! >>> shift) & 0xffff]!++;
      idx2[d] = idx[r]!;
      q2[d] = q[r]!;
    }
    [idx, idx2] = [idx2, idx];
    [q, q2] = [q2, q];
  }
  for (let r = 1; r < n; r++) {
    if (q[r] !== q[r - 1]) continue;
    const v = idx[r]!;
    const kv = key[v]!;
    let j = r - 1;
    while (j >= 0 && q[j] === q[r] && key[idx[j]!]! > kv) {
      idx[j + 1] = idx[j]!;
      j--;
    }
    idx[j + 1] = v;
  }
  return idx;
}

/** No figure constrained: every same-lot group of `setSize` is a valid set of cost 0. */
function takeAnyByLot(lotCode: Int32Array, setSize: number, count: number): SymmetricSelection {
  const byLot = new Map<number, number[]>();
  lotCode.forEach((lot, i) => {
    let g = byLot.get(lot);
    if (!g) byLot.set(lot, (g = []));
    g.push(i);
  });
  const sets: number[][] = [];
  for (const g of byLot.values()) {
    for (let t = 0; t + setSize <= g.length && sets.length < count; t += setSize) {
      sets.push(g.slice(t, t + setSize));
    }
  }
  return { sets, totalCost: 0, exact: true, note: '' };
}

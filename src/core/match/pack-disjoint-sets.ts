import { AppError } from '../errors';

/** A candidate set over a component's vertices: local indices in ascending order, and its cost. */
export interface CandidateSet {
  members: readonly number[];
  cost: number;
}

export interface Packing {
  /** costByCount[k] = least total cost of k disjoint sets (Infinity when k are impossible). */
  costByCount: Float64Array;
  /** True when costByCount is the proven optimum for every k; false after the greedy fallback. */
  exact: boolean;
  /** Indices into `sets` of a selection achieving costByCount[k]. */
  pick(k: number): number[];
}

export interface PackingLimits {
  /** Longest component the exact search takes (recursion depth). */
  maxVertices: number;
  /** Widest (last − first member) candidate set the exact search takes; ≤ 30. */
  maxSpan: number;
  /** Search states before giving up and falling back to the greedy selection. */
  maxStates: number;
}

export const DEFAULT_PACKING_LIMITS: PackingLimits = {
  maxVertices: 4000,
  maxSpan: 24,
  maxStates: 250_000,
};

/** Thrown inside the exact search when it passes its state budget; caught by the caller here. */
class BudgetExceeded extends AppError<'match_search_budget'> {
  constructor() {
    super('match_search_budget');
  }
}

/**
 * Least-cost disjoint selections of k candidate sets for every k ≤ maxCount.
 *
 * Exact method: vertices are taken in index order (the callers order them by the matching key,
 * so a set's members are close together). The state is (i, mask): every vertex before i is
 * decided and `mask` marks which of vertices i … i+span are already taken by an earlier set.
 * Vertex i is either left out or opened by one of the sets whose first member it is; memoised,
 * this visits each reachable state once and returns, per k, the exact optimum. The state space
 * is at most n·2^span, usually far fewer; past `limits` the greedy (cheapest disjoint first)
 * selection is returned instead, marked not exact.
 */
export function packDisjointSets(
  vertexCount: number,
  sets: readonly CandidateSet[],
  maxCount: number,
  limits: PackingLimits = DEFAULT_PACKING_LIMITS,
): Packing {
  let span = 0;
  for (const s of sets) span = Math.max(span, s.members[s.members.length - 1]! - s.members[0]!);
  if (vertexCount <= limits.maxVertices && span <= Math.min(limits.maxSpan, 30)) {
    try {
      return packExact(vertexCount, sets, maxCount, span + 1, limits.maxStates);
    } catch (e) {
      if (!(e instanceof BudgetExceeded)) throw e;
    }
  }
  return packGreedy(sets, maxCount);
}

function packExact(
  n: number,
  sets: readonly CandidateSet[],
  maxCount: number,
  width: number,
  maxStates: number,
): Packing {
  const startingAt: number[][] = Array.from({ length: n }, () => []);
  const relMask = new Int32Array(sets.length);
  sets.forEach((s, idx) => {
    const first = s.members[0]!;
    let m = 0;
    for (const v of s.members) m |= 1 << (v - first);
    relMask[idx] = m;
    startingAt[first]!.push(idx);
  });
  const len = maxCount + 1;
  const done = new Float64Array(len).fill(Infinity);
  done[0] = 0;
  const memo = new Map<number, Float64Array>();
  const scale = 2 ** width;

  const solve = (i: number, mask: number): Float64Array => {
    if (i === n) return done;
    const key = i * scale + mask;
    const hit = memo.get(key);
    if (hit) return hit;
    if (memo.size >= maxStates) throw new BudgetExceeded();
    const res = solve(i + 1, mask >>> 1).slice();
    if ((mask & 1) === 0) {
      for (const idx of startingAt[i]!) {
        if ((mask & relMask[idx]!) !== 0) continue;
        const next = solve(i + 1, (mask | relMask[idx]!) >>> 1);
        const c = sets[idx]!.cost;
        for (let k = 0; k + 1 < len; k++) {
          const v = next[k]! + c;
          if (v < res[k + 1]!) res[k + 1] = v;
        }
      }
    }
    memo.set(key, res);
    return res;
  };

  const costByCount = solve(0, 0);
  const pick = (k: number): number[] => {
    const chosen: number[] = [];
    let mask = 0;
    for (let i = 0; i < n && k > 0; i++) {
      const target = solve(i, mask)[k]!;
      let next = mask >>> 1;
      if ((mask & 1) === 0 && solve(i + 1, next)[k] !== target) {
        for (const idx of startingAt[i]!) {
          if ((mask & relMask[idx]!) !== 0) continue;
          const taken = (mask | relMask[idx]!) >>> 1;
          if (solve(i + 1, taken)[k - 1]! + sets[idx]!.cost === target) {
            chosen.push(idx);
            k--;
            next = taken;
            break;
          }
        }
      }
      mask = next;
    }
    return chosen;
  };
  return { costByCount, exact: true, pick };
}

function packGreedy(sets: readonly CandidateSet[], maxCount: number): Packing {
  const order = sets.map((_, i) => i).sort((a, b) => sets[a]!.cost - sets[b]!.cost);
  const used = new Set<number>();
  const taken: number[] = [];
  for (const idx of order) {
    if (taken.length === maxCount) break;
    const m = sets[idx]!.members;
    if (m.some((v) => used.has(v))) continue;
    for (const v of m) used.add(v);
    taken.push(idx);
  }
  const costByCount = new Float64Array(maxCount + 1).fill(Infinity);
  costByCount[0] = 0;
  taken.forEach((idx, k) => (costByCount[k + 1] = costByCount[k]! + sets[idx]!.cost));
  return { costByCount, exact: false, pick: (k) => taken.slice(0, k) };
}

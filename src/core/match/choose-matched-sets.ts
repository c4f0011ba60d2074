import {
  copySlot,
  evaluateIntoArrays,
  figuresAt,
  firstSlots,
  reusedFigureArrays,
  type FigureArrays,
} from './evaluate-at-operating-point';
import { int32Scratch } from './scratch';
import { chooseCascodeSets, type CascodeMember } from './choose-cascode-sets';
import { chooseSymmetricSets } from './choose-symmetric-sets';
import { AppError } from '../errors';
import { MatchRequestError } from './match-request-error';
import type {
  LooserToleranceCounts,
  MatchedPart,
  MatchedSet,
  MatchInput,
  MatchResult,
  MatchTolerances,
  OperatingFigures,
} from './match-types';
import type { PackingLimits } from './pack-disjoint-sets';
import { measureSetMismatch, setCostFromMismatch } from './set-mismatch';

const candidateScratch = int32Scratch();
const lotScratch = int32Scratch();

interface CoreSet {
  members: { u: number; role: MatchedPart['role']; cascodeIndex?: 0 | 1; figures: OperatingFigures }[];
  headroomV?: number;
}

interface CoreResult {
  sets: CoreSet[];
  exact: boolean;
  note: string;
}

/**
 * Proposes up to `count` disjoint matched sets from the candidates at the designer's operating
 * point: the largest number of sets meeting every tolerance, and among those the least total
 * cost (Σ over sets of ΔVGS/maxΔVGS + gm mismatch/maxGm + IDSS mismatch/maxIdss; see
 * `setCostFromMismatch`). `guarantee` says whether that optimum is proven (see
 * `chooseSymmetricSets` and `chooseCascodeSets` for where it is). Parts that cannot run at the
 * point are listed in `unusable` with the reason. `looser` gives the counts the same stock would
 * give with looser tolerances (capped at `count`), so a designer sees which tolerance binds.
 * Cascode shapes need a `current` operating point (the shared drain current).
 */
export function chooseMatchedSets(input: MatchInput, limits?: PackingLimits): MatchResult {
  const { operatingPoint: op, shape, tolerances: tol } = input;
  const count = input.count;
  if (!Number.isInteger(count) || count < 0) {
    throw new MatchRequestError('match_request_invalid', { problem: 'count', count });
  }
  for (const [name, v] of Object.entries(tol)) {
    if (!(v >= 0)) {
      throw new MatchRequestError('match_request_invalid', { problem: 'tolerance', name, value: v });
    }
  }
  const opOk =
    op.vdsV > 0 &&
    op.vdsV < Infinity &&
    (op.kind !== 'current' || (op.idA > 0 && op.idA < Infinity)) &&
    (op.kind !== 'self_bias' || (op.rsOhm >= 0 && op.rsOhm < Infinity));
  if (!opOk) {
    throw new MatchRequestError('match_request_invalid', { problem: 'operating_point' });
  }
  const cascodeShape = shape === 'cascode_pair' || shape === 'matched_cascode_pairs';
  if (cascodeShape && op.kind !== 'current') {
    throw new MatchRequestError('cascode_needs_current');
  }

  const sameLot = input.options?.sameLot === true;
  const total = input.candidates.length;
  // Working arrays shared across requests: everything kept is copied out before returning.
  const all = reusedFigureArrays(total);
  const candidateOf = candidateScratch.take(total);
  const lotAll = lotScratch.take(total, 0);
  let unusable: MatchResult['unusable'] = [];
  let m = 0;
  let figs: FigureArrays = all;
  let lotCode = lotAll;
  /**
   * Evaluates every candidate. Serials are normally unique (they come from stock), so the
   * duplicate check, a string hash per part, runs only when a first answer used one serial twice.
   */
  const prepare = (checkDuplicates: boolean) => {
    unusable = [];
    m = 0;
    const given = input.evaluated;
    if (given && (given.unusable.length !== total || given.figures.vgsV.length < total)) {
      throw new AppError('match_figures_mismatch', { candidates: total, figures: given.unusable.length });
    }
    const seen = new Set<string>();
    const lotCodes = new Map<string, number>();
    for (let i = 0; i < total; i++) {
      const candidate = input.candidates[i]!;
      if (checkDuplicates && seen.size === seen.add(candidate.id).size) {
        unusable.push({ id: candidate.id, code: 'duplicate_serial', reason: 'serial listed twice; the first entry is used' });
        continue;
      }
      if (sameLot && candidate.lotId === null) {
        unusable.push({ id: candidate.id, code: 'no_lot', reason: 'same-lot sets asked for, and this part has no lot' });
        continue;
      }
      // Figures given for this candidate are copied; an unusable one is evaluated again for its reason.
      const bad =
        given && !given.unusable[i]
          ? (copySlot(given.figures, i, all, m), null)
          : evaluateIntoArrays(candidate, op, all, m, input.temperatureC);
      if (bad) {
        unusable.push({ id: candidate.id, code: bad.code, reason: bad.reason });
        continue;
      }
      if (sameLot) {
        const code = lotCodes.get(candidate.lotId!) ?? lotCodes.size;
        lotCodes.set(candidate.lotId!, code);
        lotAll[m] = code;
      }
      candidateOf[m++] = i;
    }
    figs = firstSlots(all, m);
    lotCode = lotAll.subarray(0, m);
  };
  const candidateAt = (u: number) => input.candidates[candidateOf[u]!]!;

  const runCore = (t: MatchTolerances, want: number): CoreResult => {
    if (cascodeShape) {
      const r = chooseCascodeSets(
        {
          parts: Array.from({ length: m }, (_, u) => candidateAt(u)),
          compareAtC: input.temperatureC,
          upper: Array.from({ length: m }, (_, u) => figuresAt(figs, u, op.vdsV)),
          lotCode,
        },
        shape,
        (op as { idA: number }).idA,
        want,
        t,
        limits,
      );
      return {
        sets: r.sets.map((s) => ({
          members: s.members.map((c: CascodeMember) => ({
            u: c.index,
            role: c.role,
            cascodeIndex: c.cascodeIndex,
            figures: c.figures,
          })),
          headroomV: s.headroomV,
        })),
        exact: r.exact,
        note: r.note,
      };
    }
    const r = chooseSymmetricSets(
      { vgsV: figs.vgsV, gmS: figs.gmS, idssA: figs.idssA, lotCode, vgsSigmaV: figs.vgsSigmaV },
      shape === 'pair' ? 2 : 4,
      want,
      t,
      op.kind !== 'idss',
      limits,
    );
    const roles = ['a', 'b', 'c', 'd'] as const;
    return {
      sets: r.sets.map((members) => ({
        members: members
          .map((u) => ({ u, figures: figuresAt(figs, u, op.vdsV) }))
          .sort((x, y) => x.figures.vgsV - y.figures.vgsV || x.u - y.u)
          .map((c, k) => ({ ...c, role: roles[k]! })),
      })),
      exact: r.exact,
      note: r.note,
    };
  };

  prepare(false);
  let core = runCore(tol, count);
  const chosenIds = core.sets.flatMap((x) => x.members.map((c) => candidateAt(c.u).id));
  if (new Set(chosenIds).size !== chosenIds.length) {
    prepare(true);
    core = runCore(tol, count);
  }
  const sets: MatchedSet[] = core.sets.map((s) => {
    const matched = s.members.filter((m) => shape !== 'matched_cascode_pairs' || m.role === 'lower');
    const mismatch =
      shape === 'cascode_pair'
        ? { dvgsV: 0, dvgsSigmaV: 0, dvgsGuardedV: 0, gmMismatch: 0, idssMismatch: 0 }
        : measureSetMismatch(matched.map((m) => m.figures));
    const costs = setCostFromMismatch(mismatch, tol);
    const parts: MatchedPart[] = s.members.map((m) => {
      const c = candidateAt(m.u);
      const part: MatchedPart = { id: c.id, lotId: c.lotId, binCode: c.binCode, role: m.role, ...m.figures };
      if (shape === 'matched_cascode_pairs' && m.cascodeIndex !== undefined) part.cascodeIndex = m.cascodeIndex;
      return part;
    });
    const { dvgsGuardedV: _guarded, ...shown } = mismatch;
    const set: MatchedSet = { parts, ...shown, costs };
    if (s.headroomV !== undefined) set.cascodeHeadroomV = s.headroomV;
    return set;
  });

  const found = sets.length;
  const looserCount = (t: MatchTolerances) => (found === count ? count : runCore(t, count).sets.length);
  const scaled = (f: number): MatchTolerances => ({
    maxDvgsV: tol.maxDvgsV * f,
    maxGmMismatch: tol.maxGmMismatch * f,
    maxIdssMismatch: tol.maxIdssMismatch * f,
    cascodeMarginV: tol.cascodeMarginV / f,
  });
  const looser: LooserToleranceCounts = {
    allTimes1_5: looserCount(scaled(1.5)),
    allTimes2: looserCount(scaled(2)),
    onlyOneTimes2: {
      maxDvgsV: looserCount({ ...tol, maxDvgsV: tol.maxDvgsV * 2 }),
      maxGmMismatch: looserCount({ ...tol, maxGmMismatch: tol.maxGmMismatch * 2 }),
      maxIdssMismatch: looserCount({ ...tol, maxIdssMismatch: tol.maxIdssMismatch * 2 }),
      cascodeMarginV: cascodeShape ? looserCount({ ...tol, cascodeMarginV: tol.cascodeMarginV / 2 }) : found,
    },
  };

  return {
    sets,
    requestedCount: count,
    totalCost: sets.reduce((s, x) => s + x.costs.total, 0),
    guarantee: {
      kind: core.exact ? 'exact' : 'heuristic',
      note: core.exact
        ? 'largest number of sets (up to the count asked) and, for that number, the least total cost'
        : `every set meets every tolerance; ${core.note}, so more sets or a lower total may exist`,
    },
    unusable,
    looser,
  };
}

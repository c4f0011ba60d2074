import type { PartBasis, PartFigures } from '../operating-point/part-operating-figures';
import type { FigureArrays } from './evaluate-at-operating-point';

/**
 * Where the designer runs the parts. All values N-equivalent and SI (A, V, Ω); a P-channel
 * request is converted with `toNEquivalent` before it reaches the core.
 * - `current`: every part carries `idA` at `vdsV` (VGS is what it takes).
 * - `idss`: VGS = 0; every part carries its own IDSS at `vdsV`.
 * - `self_bias`: a source resistor `rsOhm` to ground, gate grounded; every part settles at its own
 *   ID = f(VGS = −ID·RS).
 */
export type OperatingPoint =
  | { kind: 'current'; idA: number; vdsV: number }
  | { kind: 'idss'; vdsV: number }
  | { kind: 'self_bias'; rsOhm: number; vdsV: number };

/**
 * - `pair`, `quad`: 2 or 4 parts, every figure within tolerance across the set.
 * - `cascode_pair`: one lower + one upper, upper gate tied to lower source.
 * - `matched_cascode_pairs`: two cascodes whose lowers are matched to each other.
 */
export type MatchShape = 'pair' | 'quad' | 'cascode_pair' | 'matched_cascode_pairs';

/** A tolerance of `Infinity` leaves that figure unconstrained (and out of the cost). */
export interface MatchTolerances {
  /** max − min VGS within a set (V). */
  maxDvgsV: number;
  /** 1 − min/max gm within a set (so 0.03 is "gfs ratio ≥ 0.97"). */
  maxGmMismatch: number;
  /** 1 − min/max IDSS within a set (so 0.05 is "IDSS ratio ≥ 0.95"). */
  maxIdssMismatch: number;
  /** Cascodes only: required VDS(lower) − VDS(sat, lower) ≥ this (V). */
  cascodeMarginV: number;
}

/** A part in stock: its serial, lot and bin, and what its figures are computed from. */
export interface MatchCandidate extends PartBasis {
  /** The part's serial. */
  id: string;
  lotId: string | null;
  binCode: string | null;
}

export interface MatchInput {
  candidates: readonly MatchCandidate[];
  operatingPoint: OperatingPoint;
  shape: MatchShape;
  /** How many sets are wanted (the picker never returns more). */
  count: number;
  tolerances: MatchTolerances;
  /** `sameLot`: every part of a set shares one (non-null) lot. */
  options?: { sameLot?: boolean };
  /** Parts are compared at this temperature (°C; 25 when absent). */
  temperatureC?: number;
  /**
   * The candidates' figures at this operating point and temperature, already computed
   * (`evaluateRange` over every candidate, slot i for candidate i); absent: computed here.
   */
  evaluated?: { figures: FigureArrays; unusable: Uint8Array };
}

/**
 * Figures of one part at the operating point it actually sees in its set: `PartFigures` (the one
 * source, `partOperatingFigures`) without the model's reason and the compare temperature (the
 * request's), and with `vgsSigmaV` 0 when not known.
 */
export type OperatingFigures = Omit<PartFigures, 'modelReason' | 'temperatureC'>;

export type PartEvaluation =
  | { usable: true; figures: OperatingFigures }
  | { usable: false; code: UnusableCode; reason: string };

export type UnusableCode =
  | 'forward_gate'
  | 'not_saturated'
  | 'invalid_model'
  | 'no_lot'
  | 'duplicate_serial';

/**
 * Roles: `a`…`d` are interchangeable members of a pair or quad, in ascending VGS.
 * `lower` is the cascode's bottom part (sets the current), `upper` the part stacked on it; in a
 * matched cascode set the parts come as [lower, upper, lower, upper] and `cascodeIndex` says
 * which cascode (0 or 1) a part belongs to.
 */
export type MatchRole = 'a' | 'b' | 'c' | 'd' | 'lower' | 'upper';

export interface MatchedPart extends OperatingFigures {
  id: string;
  lotId: string | null;
  binCode: string | null;
  role: MatchRole;
  cascodeIndex?: 0 | 1;
}

/** Each term is mismatch / tolerance (0 for an unconstrained figure); `total` is their sum. */
export interface SetCost {
  dvgsTerm: number;
  gmTerm: number;
  idssTerm: number;
  total: number;
}

export interface MatchedSet {
  parts: MatchedPart[];
  /**
   * Over the matched members: all parts of a pair or quad, the two lowers of matched cascodes;
   * 0 for a lone cascode pair, where nothing is matched.
   */
  dvgsV: number;
  /** One standard deviation of `dvgsV`: the highest and lowest members' σ combined (V). */
  dvgsSigmaV: number;
  gmMismatch: number;
  idssMismatch: number;
  costs: SetCost;
  /** Cascode shapes: smallest (−VGS(upper)) − VDS(sat, lower) over the set's cascodes (V). */
  cascodeHeadroomV?: number;
}

/**
 * `exact`: count is the maximum possible (capped at `count`) and total cost the minimum among
 * selections of that count. `heuristic`: every set meets every tolerance, but more sets or a lower
 * total may exist; `note` says where the limit was hit.
 */
export interface MatchGuarantee {
  kind: 'exact' | 'heuristic';
  note: string;
}

export interface LooserToleranceCounts {
  /** Sets found (capped at `count`) with every tolerance 1.5× looser (margin ÷ 1.5). */
  allTimes1_5: number;
  /** … 2× looser (margin ÷ 2). */
  allTimes2: number;
  /** Only one tolerance 2× looser (margin ÷ 2), the others as requested. */
  onlyOneTimes2: Record<keyof MatchTolerances, number>;
}

export interface MatchResult {
  sets: MatchedSet[];
  requestedCount: number;
  totalCost: number;
  guarantee: MatchGuarantee;
  unusable: { id: string; code: UnusableCode; reason: string }[];
  looser: LooserToleranceCounts;
}

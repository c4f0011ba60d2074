import { binCatalogue, type BinRange } from './bin-catalogue';
import type { BinPlan } from './bin-plan';

/**
 * The rule that keeps bin codes honest across plan versions: a code printed on a bag or a
 * drawer always means one range. A new version
 *   1. keeps the code of any earlier bin whose ranges it repeats exactly (the bag stays valid),
 *   2. otherwise uses the cell's positional code ("I07-P03") when no earlier version used it,
 *   3. otherwise gives the cell a new code, its positional code with the version ("I07-P03.v2").
 * So no version ever reuses a code for a different range.
 */
export interface EarlierBin {
  code: string;
  /** Ranges as stored with the bin (empty for the hold bin). */
  ranges: readonly BinRange[];
}

const RELATIVE_TOLERANCE = 1e-9;

function sameValue(a: number, b: number): boolean {
  return Math.abs(a - b) <= RELATIVE_TOLERANCE * Math.max(Math.abs(a), Math.abs(b), 1e-12);
}

/** Same quantities and the same edges (to rounding of stored floats). */
export function sameRanges(a: readonly BinRange[], b: readonly BinRange[]): boolean {
  return (
    a.length === b.length &&
    a.every((r, i) => r.quantity === b[i].quantity && sameValue(r.loValue, b[i].loValue) && sameValue(r.hiValue, b[i].hiValue))
  );
}

/** `plan` with the `codes` the rule above gives it as version `version` after `earlier` (bins of every earlier version). */
export function withStableBinCodes(plan: BinPlan, earlier: readonly EarlierBin[], version: number): BinPlan {
  const { codes: _ignored, ...positionalPlan } = plan;
  const cells = binCatalogue(positionalPlan).filter((e) => !e.isHold);
  const earlierGrid = earlier.filter((b) => b.ranges.length > 0);
  const usedEarlier = new Set(earlier.map((b) => b.code));
  const taken = new Set<string>();
  const codeOf = new Map<string, string>();
  // 1. exact repeats keep their code.
  for (const c of cells) {
    const same = earlierGrid.find((b) => sameRanges(b.ranges, c.ranges) && !taken.has(b.code));
    if (same) {
      codeOf.set(c.code, same.code);
      taken.add(same.code);
    }
  }
  // 2. and 3. the rest: positional when never used before, else a code of this version.
  for (const c of cells) {
    if (codeOf.has(c.code)) continue;
    let code = c.code;
    if (usedEarlier.has(code) || taken.has(code)) {
      code = `${c.code}.v${version}`;
      for (let k = 2; usedEarlier.has(code) || taken.has(code); k++) code = `${c.code}.v${version}-${k}`;
    }
    codeOf.set(c.code, code);
    taken.add(code);
  }
  const codes = Object.fromEntries([...codeOf].filter(([positional, code]) => positional !== code));
  return Object.keys(codes).length ? { ...positionalPlan, codes } : positionalPlan;
}

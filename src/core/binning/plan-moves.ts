import { assignBin } from './assign-bin';
import { binCatalogue } from './bin-catalogue';
import type { BinFigures, BinPlan } from './bin-plan';

export interface PartForMove {
  serial: string;
  figures: BinFigures;
  /** The bin the part sits in now; null when never binned (then the old plan's bin is assumed). */
  currentCode: string | null;
}

export interface BinMove {
  serial: string;
  from: string;
  to: string;
}

export interface PlanMoves {
  /** Parts whose bin changes, in input order. */
  moves: BinMove[];
  /** Number of moves per from → to pair, largest first. */
  counts: { from: string; to: string; count: number }[];
  unchangedCount: number;
  /** Parts whose recorded bin differs from what the old plan gives for their figures. */
  discrepancies: { serial: string; currentCode: string; oldPlanCode: string }[];
  /** Codes present in both plans whose label (range) changed: the bag stays, its label must be reprinted. */
  relabelled: { code: string; oldLabel: string; newLabel: string }[];
}

/** What changes when a device type moves from `oldPlan` to `newPlan`. Pure; nothing is moved. */
export function planMoves(oldPlan: BinPlan, newPlan: BinPlan, parts: readonly PartForMove[]): PlanMoves {
  const moves: BinMove[] = [];
  const discrepancies: PlanMoves['discrepancies'] = [];
  const tally = new Map<string, { from: string; to: string; count: number }>();
  let unchangedCount = 0;
  for (const part of parts) {
    const oldPlanCode = assignBin(oldPlan, part.figures).code;
    const from = part.currentCode ?? oldPlanCode;
    if (part.currentCode !== null && part.currentCode !== oldPlanCode) {
      discrepancies.push({ serial: part.serial, currentCode: part.currentCode, oldPlanCode });
    }
    const to = assignBin(newPlan, part.figures).code;
    if (from === to) {
      unchangedCount++;
      continue;
    }
    moves.push({ serial: part.serial, from, to });
    const key = `${from}\u0000${to}`;
    const entry = tally.get(key) ?? { from, to, count: 0 };
    entry.count++;
    tally.set(key, entry);
  }
  const counts = [...tally.values()].sort(
    (a, b) => b.count - a.count || a.from.localeCompare(b.from) || a.to.localeCompare(b.to),
  );
  const oldLabels = new Map(binCatalogue(oldPlan).map((e) => [e.code, e.label]));
  const relabelled = binCatalogue(newPlan)
    .filter((e) => oldLabels.has(e.code) && oldLabels.get(e.code) !== e.label)
    .map((e) => ({ code: e.code, oldLabel: oldLabels.get(e.code)!, newLabel: e.label }));
  return { moves, counts, unchangedCount, discrepancies, relabelled };
}

import { binCatalogue } from '../../../../core/binning';
import { getDb } from '../../../../db/client';
import { requirePermission, type Actor } from '../../identity';
import { findDeviceType } from '../bins/device-type-ref';
import { computeRebin } from './compute-moves';
import { activePlanOf, assertPlanSize, parsePlanDefinition } from './load';
import { BinPlanDraft } from './schemas';

/** Moves listed in full up to this many; the counts always cover every part. */
const MOVE_LIST_LIMIT = 2000;

/**
 * What saving a plan would do, without saving anything: the bins it makes, how many parts move
 * and from which bin to which, which parts get their first bin, and which bags need new labels.
 */
export async function previewBinPlan({ actor, input }: { actor: Actor | null; input: unknown }) {
  requirePermission(actor, 'binPlans:manage');
  const draft = BinPlanDraft.parse(input);
  const plan = parsePlanDefinition(draft.definition);
  const binCount = assertPlanSize(plan);
  const db = getDb();
  const type = await findDeviceType(db, draft.device_type);
  const active = await activePlanOf(db, type.id);
  const r = await computeRebin(db, type, active, plan, { lock: false });
  const newCounts = new Map<string, number>();
  for (const p of r.parts) newCounts.set(p.newCode, (newCounts.get(p.newCode) ?? 0) + 1);
  return {
    device_type: { id: type.id, name: type.name, channel: type.channel },
    based_on_plan_id: active?.id ?? null,
    based_on_version: active?.version ?? null,
    next_version: (active?.version ?? 0) + 1,
    bin_count: binCount,
    bins: binCatalogue(plan).map((b) => ({ code: b.code, label: b.label, is_hold: b.isHold, parts: newCounts.get(b.code) ?? 0 })),
    parts_considered: r.parts.length,
    moved_count: r.moves.length,
    unchanged_count: r.unchangedCount,
    newly_binned_count: r.newlyBinned.length,
    move_counts: r.counts,
    moves: r.moves.slice(0, MOVE_LIST_LIMIT),
    newly_binned: r.newlyBinned.slice(0, MOVE_LIST_LIMIT),
    moves_left_off: Math.max(0, r.moves.length - MOVE_LIST_LIMIT),
    relabelled: r.relabelled,
    discrepancies: r.discrepancies,
  };
}

import { binCatalogue } from '~/core/binning';
import { eq, max } from 'drizzle-orm';
import type { BinPlan } from '~/core/binning';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { findDeviceType } from '../bins/device-type-ref';
import { computeRebin } from './compute-moves';
import { activePlanOf, assertPlanSize, parsePlanDefinition } from './load';
import { BinPlanDraft, type BinPlanPreview } from '~/contracts/bin-plans';
import { withStableCodesFor } from './stable-codes';

/** Moves listed in full up to this many; the counts always cover every part. */
const MOVE_LIST_LIMIT = 2000;
/** Parts drawn on the preview's grids, at most. */
const POINT_LIMIT = 5000;
/** Parts that sit in a bag on a shelf: a new code for them is a bag to empty and a part to carry. */
const ON_SHELF = new Set(['in_stock', 'reserved', 'returned']);

/**
 * What saving a plan would do, without saving anything: the bins it makes, how many parts move
 * and from which bin to which, which parts get their first bin, and which bags need new labels.
 */
export async function previewBinPlan({ actor, input }: { actor: Actor | null; input: unknown }): Promise<BinPlanPreview> {
  requirePermission(actor, 'binPlans:manage');
  const draft = BinPlanDraft.parse(input);
  const draftPlan = parsePlanDefinition(draft.definition);
  const binCount = assertPlanSize(draftPlan);
  const db = getDb();
  const type = await findDeviceType(db, draft.device_type);
  const active = await activePlanOf(db, type.id);
  const [{ last }] = await db.select({ last: max(schema.binPlan.version) }).from(schema.binPlan).where(eq(schema.binPlan.deviceTypeId, type.id));
  const plan = await withStableCodesFor(db, type.id, draftPlan, (last ?? 0) + 1);
  const r = await computeRebin(db, type, active, plan, { lock: false });
  const moved = new Set(r.moves.map((m) => m.serial));
  const physical = r.parts.filter((p) => moved.has(p.serial) && ON_SHELF.has(p.status)).length;
  const newCounts = new Map<string, number>();
  for (const p of r.parts) newCounts.set(p.newCode, (newCounts.get(p.newCode) ?? 0) + 1);
  return {
    device_type: { id: type.id, name: type.name, channel: type.channel },
    based_on_plan_id: active?.id ?? null,
    based_on_version: active?.version ?? null,
    next_version: (last ?? 0) + 1,
    /** The plan as it would be saved, with the codes that keep every code to one range. */
    definition: plan,
    old_definition: (active?.definition ?? null) as BinPlan | null,
    bin_count: binCount,
    bins: binCatalogue(plan).map((b) => ({ code: b.code, label: b.label, is_hold: b.isHold, parts: newCounts.get(b.code) ?? 0 })),
    parts_considered: r.parts.length,
    moved_count: r.moves.length,
    /** Of the parts that change bin, those in a bag on a shelf (in stock, reserved, returned): the ones someone must carry. */
    physical_move_count: physical,
    points: r.parts.slice(0, POINT_LIMIT).map((p) => ({
      serial: p.serial,
      idss_a: p.figures.idssA ?? null,
      vp_v: p.figures.vpV ?? null,
      moves: moved.has(p.serial),
      on_shelf: ON_SHELF.has(p.status),
    })),
    points_left_off: Math.max(0, r.parts.length - POINT_LIMIT),
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

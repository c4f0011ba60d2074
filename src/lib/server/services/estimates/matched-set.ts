import { asc, eq } from 'drizzle-orm';
import { matchedSetImplications, sourceResistorForCurrent } from '~/core/estimates';
import { SetRequest, type MatchedSetEstimateJson } from '~/contracts/estimates';
import { getDb, schema } from '~/db/client';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { loadOwnReservation } from '../reservations/get';
import { inRequestFieldNames } from './request-field-names';
import { fitReviewWarnings, loadPartModel } from './part-model';
import { SELF_BIAS_RENAMES, selfBiasPointBody } from './self-bias';

export const MATCHED_SET_MODEL =
  'Each part at the same drain current and |VDS| (SPICE level-1, saturation): ΔVGS is a differential pair’s input offset; the gm mismatch sets a balanced mixer’s first-order LO leakage. Equal loads, gos neglected in the implications.';

interface SetMember {
  serial: string;
  role: string;
  matched: { vgs_v: number; gm_s: number; idss_a: number } | null;
}

async function membersOf(actor: Actor, body: SetRequest): Promise<Map<number, SetMember[]>> {
  const sets = new Map<number, SetMember[]>();
  if (body.serials) {
    sets.set(0, body.serials.map((serial, i) => ({ serial, role: `part ${i + 1}`, matched: null })));
    return sets;
  }
  const db = getDb();
  // Through the one ownership rule: another designer's reservation is as absent as a made-up id.
  const res = await loadOwnReservation(db, actor, body.reservation_id!).catch((err: unknown) => {
    if (err instanceof AppError && err.kind === 'not_found') {
      throw new AppError('estimate_reservation_not_found', { id: body.reservation_id }, {
        fields: [{ field: 'reservation_id', message: 'no reservation of yours with this id' }],
      });
    }
    throw err;
  });
  const rows = await db
    .select({ rp: schema.reservationPart, serial: schema.part.serial })
    .from(schema.reservationPart)
    .innerJoin(schema.part, eq(schema.part.id, schema.reservationPart.partId))
    .where(eq(schema.reservationPart.reservationId, res.id))
    .orderBy(asc(schema.reservationPart.setIndex), asc(schema.reservationPart.id));
  for (const { rp, serial } of rows) {
    const list = sets.get(rp.setIndex) ?? [];
    list.push({ serial, role: rp.role, matched: { vgs_v: rp.vgsV, gm_s: rp.gmS, idss_a: rp.idssA } });
    sets.set(rp.setIndex, list);
  }
  if (sets.size === 0) {
    throw new AppError('estimate_reservation_empty', { id: res.id }, { fields: [{ field: 'reservation_id', message: 'the reservation holds no parts' }] });
  }
  return sets;
}

/**
 * Every part of a set (a reservation's sets, or a list of serials) at one operating point, and
 * what the spread means for a differential pair and a balanced mixer, pair by pair.
 */
export async function estimateMatchedSet({ actor, input }: { actor: Actor | null; input: unknown }): Promise<MatchedSetEstimateJson> {
  requirePermission(actor, 'estimates:use');
  const body = SetRequest.parse(input);
  const sets = await membersOf(actor, body);
  const db = getDb();
  const out = [];
  for (const [setIndex, members] of sets) {
    const parts = [];
    for (const m of members) {
      try {
        const model = await loadPartModel(db, m.serial, 'serials');
        const point = inRequestFieldNames(
          () => sourceResistorForCurrent(model.basis, body.target_drain_current_a, body.vds_v, { drainLoadOhm: body.drain_load_ohm, channel: model.channel }),
          SELF_BIAS_RENAMES,
        );
        parts.push({ serial: m.serial, role: m.role, device_type: model.deviceType, idss_a: model.idssA, matched: m.matched, operating_point: selfBiasPointBody(point), warnings: fitReviewWarnings(model), error: null });
      } catch (err) {
        // Request-wide values were checked by SetRequest: what fails here belongs to this part.
        if (!(err instanceof AppError)) throw err;
        parts.push({ serial: m.serial, role: m.role, device_type: null, idss_a: null, matched: m.matched, operating_point: null, warnings: [], error: err.message });
      }
    }
    const pairs = [];
    for (let i = 0; i < parts.length; i++) {
      for (let j = i + 1; j < parts.length; j++) {
        const a = parts[i].operating_point;
        const b = parts[j].operating_point;
        if (!a || !b) continue;
        const gmMean = (a.gm_s + b.gm_s) / 2;
        const dvgs = a.vgs_v - b.vgs_v;
        const gmMismatch = Math.abs(a.gm_s - b.gm_s) / gmMean;
        const imp = matchedSetImplications({ dvgsV: dvgs, gmMismatch, gmS: gmMean, drainLoadOhm: body.drain_load_ohm, loAmplitudeV: body.lo_amplitude_v });
        pairs.push({
          a: parts[i].serial,
          b: parts[j].serial,
          dvgs_v: dvgs,
          gm_mismatch: gmMismatch,
          gm_mean_s: gmMean,
          idss_ratio: Math.min(parts[i].idss_a!, parts[j].idss_a!) / Math.max(parts[i].idss_a!, parts[j].idss_a!),
          input_offset_v: imp.inputOffsetV,
          drain_current_imbalance_a: imp.drainCurrentImbalanceA,
          output_offset_v: imp.outputOffsetV,
          lo_leakage_relative_db: imp.loLeakageRelativeDb,
          lo_leakage_current_a: imp.loLeakageCurrentA,
        });
      }
    }
    out.push({ set_index: setIndex, parts, pairs });
  }
  return {
    model: MATCHED_SET_MODEL,
    operating_point: { drain_current_a: body.target_drain_current_a, vds_v: body.vds_v, drain_load_ohm: body.drain_load_ohm ?? null, lo_amplitude_v: body.lo_amplitude_v ?? null },
    sets: out,
  };
}

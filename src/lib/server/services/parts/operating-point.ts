import { eq } from 'drizzle-orm';
import { OperatingPointQuery, type OperatingPointJson } from '~/contracts/parts';
import { fromNEquivalent, vgsAtCurrentV } from '~/core/jfet-model';
import { partOperatingFigures } from '~/core/operating-point/part-operating-figures';
import { normalizeSerial } from '~/core/serial/normalize-serial';
import { getDb, schema } from '~/db/client';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { loadPartBases } from './part-basis';

/**
 * One part's VGS, gm and gos at a drain current and VDS, from `partOperatingFigures` — the same
 * figures matching, estimates and every set view use. VGS in datasheet sign; `uncertainty_v` is
 * one standard deviation of VGS (null when the fit states none); `source` says whether the point
 * was read from the part's measurements or taken from its model outside them.
 */
export async function getPartOperatingPoint({ actor, serial, query }: { actor: Actor | null; serial: string; query: unknown }): Promise<OperatingPointJson> {
  requirePermission(actor, 'parts:read');
  const q = OperatingPointQuery.parse(query);
  const wanted = normalizeSerial(serial);
  const db = getDb();
  const [part] = await db.select({ id: schema.part.id }).from(schema.part).where(eq(schema.part.serial, wanted)).limit(1);
  if (!part) throw new AppError('part_not_found', { serial: wanted });
  const stored = (await loadPartBases(db, [part.id])).get(part.id);
  if (!stored) throw new AppError('part_has_no_fit', { serial: wanted });
  const e = partOperatingFigures(stored.basis, { kind: 'current', idA: q.id_a, vdsV: q.vds_v }, q.temperature_c);
  if (!e.usable) {
    throw new AppError('part_cannot_run_there', { serial: wanted, idA: q.id_a, vdsV: q.vds_v, reason: e.reason }, {
      fields: [{ field: e.code === 'not_saturated' ? 'vds_v' : 'id_a', message: e.reason }],
    });
  }
  const f = e.figures;
  const sign = (x: number) => fromNEquivalent(stored.channel, x);
  return {
    serial: wanted,
    channel: stored.channel,
    id_a: sign(q.id_a),
    vds_v: sign(q.vds_v),
    vgs_v: sign(f.vgsV),
    gm_s: f.gmS,
    gos_s: Number.isFinite(f.gosS) ? f.gosS : null,
    source: f.source,
    /** Why the model was used: the point lies outside what was measured. */
    model_reason: f.modelReason,
    uncertainty_v: Number.isFinite(f.vgsSigmaV) ? f.vgsSigmaV : null,
    temperature_c: f.temperatureC,
    measured_at_c: stored.basis.measuredAtC ?? null,
    temperature_shift_v: sign(f.temperatureShiftV),
    /** The fitted model's VGS at the same point and the sweep's temperature, for comparison. */
    model_vgs_v: sign(vgsAtCurrentV(stored.basis.params, q.id_a, q.vds_v)),
  };
}

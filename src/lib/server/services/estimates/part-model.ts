import { eq } from 'drizzle-orm';
import type { Channel, JfetParams } from '~/core/jfet-model';
import { partOperatingFigures, type PartBasis } from '~/core/operating-point/part-operating-figures';
import { basisFromColumns } from '../parts/part-basis';
import type { EstimatePartJson } from '~/contracts/estimates';
import { schema, type DbOrTx } from '~/db/client';
import { AppError } from '~/lib/server/errors';

/** A stored part's current fit, as the estimates use it. */
export interface PartModel {
  serial: string;
  deviceType: string;
  channel: Channel;
  lotCode: string | null;
  status: string;
  fitId: number;
  review: string;
  params: JfetParams;
  /** What `partOperatingFigures` computes the part's figures from. */
  basis: PartBasis;
  /** IDSS magnitude at `idssVdsV` (`partOperatingFigures`: measured where the sweep reaches it) and VP in datasheet sign. */
  idssA: number;
  idssVdsV: number;
  vpV: number;
}

/** Loads a part by serial with its current fit; 404 when unknown, 409 when it has no fit. */
export async function loadPartModel(db: DbOrTx, serial: string, field = 'serial'): Promise<PartModel> {
  const rows = await db
    .select({ part: schema.part, fit: schema.fit, type: schema.deviceType, lotCode: schema.lot.code, measuredAtC: schema.sweep.temperatureC })
    .from(schema.part)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .leftJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
    .leftJoin(schema.sweep, eq(schema.sweep.id, schema.fit.sweepId))
    .leftJoin(schema.lot, eq(schema.lot.id, schema.part.lotId))
    .where(eq(schema.part.serial, serial))
    .limit(1);
  const row = rows[0];
  if (!row) {
    throw new AppError('part_not_found', { serial, field }, {
      fields: [{ field, message: `no part with serial '${serial}'` }],
    });
  }
  if (!row.fit) {
    throw new AppError('part_has_no_fit', { serial, field }, {
      fields: [{ field, message: `part ${serial} has no current fit` }],
    });
  }
  const f = row.fit;
  const basis = basisFromColumns(f, row.measuredAtC, { vtotcVPerC: row.type.vtotcVPerC, betatcePctPerC: row.type.betatcePctPerC });
  const idss = partOperatingFigures(basis, { kind: 'idss', vdsV: f.idssVdsV });
  return {
    serial,
    deviceType: row.type.name,
    channel: row.type.channel,
    lotCode: row.lotCode,
    status: row.part.status,
    fitId: f.id,
    review: f.review,
    params: basis.params,
    basis,
    // The fit's own column when the figure comes from the model, so both paths agree to the last digit.
    idssA: idss.usable && idss.figures.source === 'measured' ? idss.figures.idssA : f.idssA,
    idssVdsV: f.idssVdsV,
    vpV: f.vpV,
  };
}

/** What the response says about the stored part an estimate used. */
export function describePartModel(m: PartModel): EstimatePartJson {
  return {
    serial: m.serial,
    device_type: m.deviceType,
    channel: m.channel,
    lot: m.lotCode,
    status: m.status,
    fit_id: m.fitId,
    fit_review: m.review,
    idss_a: m.idssA,
    idss_vds_v: m.idssVdsV,
    vp_v: m.vpV,
    vto_v: m.params.vtoV,
    beta_a_per_v2: m.params.betaAPerV2,
    lambda_per_v: m.params.lambdaPerV,
    rs_ohm: m.params.rsOhm,
    rd_ohm: m.params.rdOhm,
  };
}

/** A warning when the fit an estimate rests on has not been accepted. */
export function fitReviewWarnings(m: PartModel): string[] {
  if (m.review === 'accepted' || m.review === 'auto_accepted') return [];
  return [`The current fit of ${m.serial} is ${m.review.replace('_', ' ')}, not accepted: treat these figures with care.`];
}

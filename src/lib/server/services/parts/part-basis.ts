import { eq, inArray } from 'drizzle-orm';
import type { Channel } from '~/core/jfet-model';
import { operatingTableFromBytes } from '~/core/operating-point/operating-table';
import type { PartBasis } from '~/core/operating-point/part-operating-figures';
import { schema, type DbOrTx } from '~/db/client';

/** A stored part with everything `partOperatingFigures` needs, read in one query. */
export interface StoredPartBasis {
  partId: number;
  serial: string;
  channel: Channel;
  deviceTypeId: number;
  /** The IDSS test |VDS| of the part's fit (V). */
  idssVdsV: number;
  basis: PartBasis;
}

/**
 * The current fits of the parts with these ids, as `PartBasis` (model, measurements' operating
 * table, sweep temperature, the type's temperature coefficients). Parts without a fit are absent.
 */
export async function loadPartBases(db: DbOrTx, partIds: readonly number[]): Promise<Map<number, StoredPartBasis>> {
  if (partIds.length === 0) return new Map();
  const rows = await db
    .select({
      partId: schema.part.id,
      serial: schema.part.serial,
      channel: schema.deviceType.channel,
      deviceTypeId: schema.deviceType.id,
      vtotc: schema.deviceType.vtotcVPerC,
      betatce: schema.deviceType.betatcePctPerC,
      fit: {
        vtoV: schema.fit.vtoV,
        betaAPerV2: schema.fit.betaAPerV2,
        lambdaPerV: schema.fit.lambdaPerV,
        rsOhm: schema.fit.rsOhm,
        rdOhm: schema.fit.rdOhm,
        idssVdsV: schema.fit.idssVdsV,
        operatingTable: schema.fit.operatingTable,
        modelVgsSigmaV: schema.fit.modelVgsSigmaV,
      },
      measuredAtC: schema.sweep.temperatureC,
    })
    .from(schema.part)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .innerJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
    // A fit always has its sweep in the app; rows written by imports or fixtures may not.
    .leftJoin(schema.sweep, eq(schema.sweep.id, schema.fit.sweepId))
    .where(inArray(schema.part.id, [...partIds]));
  return new Map(
    rows.map((r) => [
      r.partId,
      {
        partId: r.partId,
        serial: r.serial,
        channel: r.channel,
        deviceTypeId: r.deviceTypeId,
        idssVdsV: r.fit.idssVdsV,
        basis: basisFromColumns(r.fit, r.measuredAtC, { vtotcVPerC: r.vtotc, betatcePctPerC: r.betatce }),
      },
    ]),
  );
}

/** A `PartBasis` from a fit row's columns, its sweep's temperature and the type's coefficients. */
export function basisFromColumns(
  fit: {
    vtoV: number;
    betaAPerV2: number;
    lambdaPerV: number;
    rsOhm: number;
    rdOhm: number;
    operatingTable: Uint8Array | null;
    modelVgsSigmaV: number | null;
  },
  measuredAtC: number | null,
  tempco: { vtotcVPerC: number; betatcePctPerC: number },
): PartBasis {
  return {
    params: { vtoV: fit.vtoV, betaAPerV2: fit.betaAPerV2, lambdaPerV: fit.lambdaPerV, rsOhm: fit.rsOhm, rdOhm: fit.rdOhm },
    table: operatingTableFromBytes(fit.operatingTable),
    measuredAtC,
    tempco,
    modelSigmaV: fit.modelVgsSigmaV ?? NaN,
  };
}

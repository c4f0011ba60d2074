import type { PartBasis } from '~/core/operating-point/part-operating-figures';

/**
 * A stock's part bases packed in shared memory, so a worker thread can read the same parts
 * without copying them: the operating tables in one Float64Array (the candidate cache's), and
 * per part BASIS_FLOATS numbers. Unpacking gives bases equal, number for number, to the ones
 * the cache hands to matching on the main thread.
 */
export const BASIS_FLOATS = 10;
const VTO = 0, BETA = 1, LAMBDA = 2, RS = 3, RD = 4, TABLE_AT = 5, MEASURED_AT = 6, VTOTC = 7, BETATCE = 8, MODEL_SIGMA = 9;

export function packBasis(part: PartBasis, into: Float64Array, slot: number): void {
  const o = slot * BASIS_FLOATS;
  const p = part.params;
  into[o + VTO] = p.vtoV;
  into[o + BETA] = p.betaAPerV2;
  into[o + LAMBDA] = p.lambdaPerV;
  into[o + RS] = p.rsOhm;
  into[o + RD] = p.rdOhm;
  into[o + TABLE_AT] = part.table ? part.table.offset : -1;
  into[o + MEASURED_AT] = part.measuredAtC ?? NaN;
  into[o + VTOTC] = part.tempco ? part.tempco.vtotcVPerC : NaN;
  into[o + BETATCE] = part.tempco ? part.tempco.betatcePctPerC : NaN;
  into[o + MODEL_SIGMA] = part.modelSigmaV ?? NaN;
}

/** The bases of `count` packed parts; `tables` is the array the table offsets point into. */
export function unpackBases(packed: Float64Array, tables: Float64Array, count: number): PartBasis[] {
  const out: PartBasis[] = new Array(count);
  for (let slot = 0; slot < count; slot++) {
    const o = slot * BASIS_FLOATS;
    const tableAt = packed[o + TABLE_AT]!;
    const measuredAt = packed[o + MEASURED_AT]!;
    const vtotc = packed[o + VTOTC]!;
    out[slot] = {
      params: {
        vtoV: packed[o + VTO]!,
        betaAPerV2: packed[o + BETA]!,
        lambdaPerV: packed[o + LAMBDA]!,
        rsOhm: packed[o + RS]!,
        rdOhm: packed[o + RD]!,
      },
      table: tableAt >= 0 ? { data: tables, offset: tableAt } : null,
      measuredAtC: Number.isNaN(measuredAt) ? null : measuredAt,
      tempco: Number.isNaN(vtotc) ? undefined : { vtotcVPerC: vtotc, betatcePctPerC: packed[o + BETATCE]! },
      modelSigmaV: packed[o + MODEL_SIGMA]!,
    };
  }
  return out;
}

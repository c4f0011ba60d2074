import type { Channel } from '../jfet-model';
import { SweepFileError } from './errors';
import {
  MAX_FORWARD_VGS_V,
  MIN_CURVES_PER_PART,
  MIN_POINTS_PER_CURVE,
  SIGN_NOISE_FRACTION,
  VGS_STEP_RESOLUTION_V,
} from './limits';
import type { ChannelSource, SweepCurve, SweepSignConvention } from './types';

/** Points as read, in file signs and SI units; parallel arrays, one entry per point. */
export interface RawSweepPoints {
  partIndex: number[];
  vgsV: number[];
  vdsV: number[];
  idA: number[];
  line: number[];
  /** Wide format: 1-based column of the ID cell; 0 in the long format. */
  column: number[];
}

export interface DeclaredChannel {
  channel: Channel;
  source: 'caller' | 'file';
  line?: number;
}

export interface NormalizedSweep {
  channel?: Channel;
  channelSource?: ChannelSource;
  signConvention: SweepSignConvention;
  /** Curves of each part (index as in `partIndex`), sorted by VGS then VDS. */
  curvesByPart: SweepCurve[][];
}

const NOISE_PERCENT = `${SIGN_NOISE_FRACTION * 100} %`;

/**
 * Decides the sign convention from the signs of VDS and ID and the declared channel, turns
 * every point N-equivalent (see jfet-model.ts), groups points into gate steps per part and
 * checks duplicates and minimum sizes. `serials[i]` names part i in messages.
 */
export function normalizeSweep(
  raw: RawSweepPoints,
  serials: string[],
  declared: DeclaredChannel | undefined,
  file: string,
): NormalizedSweep {
  const partCount = serials.length;
  const pointCount = raw.vgsV.length;
  const maxAbsVds = new Array<number>(partCount).fill(0);
  const maxAbsId = new Array<number>(partCount).fill(0);
  for (let i = 0; i < pointCount; i++) {
    const p = raw.partIndex[i];
    maxAbsVds[p] = Math.max(maxAbsVds[p], Math.abs(raw.vdsV[i]));
    maxAbsId[p] = Math.max(maxAbsId[p], Math.abs(raw.idA[i]));
  }

  const noise = SIGN_NOISE_FRACTION;
  let vdsPositiveLine = 0;
  let vdsNegativeLine = 0;
  let idPositiveLine = 0;
  let idNegativeLine = 0;
  for (let i = 0; i < pointCount; i++) {
    const p = raw.partIndex[i];
    const vds = raw.vdsV[i];
    const id = raw.idA[i];
    if (Math.abs(vds) > noise * maxAbsVds[p]) {
      if (vds > 0) vdsPositiveLine ||= raw.line[i];
      else vdsNegativeLine ||= raw.line[i];
    }
    if (Math.abs(id) > noise * maxAbsId[p]) {
      if (id > 0) idPositiveLine ||= raw.line[i];
      else idNegativeLine ||= raw.line[i];
    }
  }
  const expectedSigns =
    'one sign for VDS and ID throughout the file: positive for an N-channel part, negative for a P-channel part in datasheet signs, or positive magnitudes with "# channel: p"';
  if (vdsPositiveLine && vdsNegativeLine) {
    throw new SweepFileError(
      'mixed_signs',
      { file, line: Math.max(vdsPositiveLine, vdsNegativeLine), field: 'VDS', relatedLines: [Math.min(vdsPositiveLine, vdsNegativeLine)] },
      `VDS is positive on line ${vdsPositiveLine} and negative on line ${vdsNegativeLine}`,
      expectedSigns,
    );
  }
  if (idPositiveLine && idNegativeLine) {
    throw new SweepFileError(
      'mixed_signs',
      { file, line: Math.max(idPositiveLine, idNegativeLine), field: 'ID', relatedLines: [Math.min(idPositiveLine, idNegativeLine)] },
      `ID is positive on line ${idPositiveLine} and negative on line ${idNegativeLine} (currents within ${NOISE_PERCENT} of the part's largest |ID| may have either sign)`,
      expectedSigns,
    );
  }
  if ((vdsPositiveLine && idNegativeLine) || (vdsNegativeLine && idPositiveLine)) {
    const vdsLine = vdsPositiveLine || vdsNegativeLine;
    const idLine = idPositiveLine || idNegativeLine;
    throw new SweepFileError(
      'mixed_signs',
      { file, line: Math.max(vdsLine, idLine), field: 'ID', relatedLines: [Math.min(vdsLine, idLine)] },
      `VDS is ${vdsPositiveLine ? 'positive' : 'negative'} (line ${vdsLine}) but ID is ${idPositiveLine ? 'positive' : 'negative'} (line ${idLine})`,
      'VDS and ID with the same sign',
    );
  }
  const negative = vdsNegativeLine > 0 || idNegativeLine > 0;
  const firstSignedLine = vdsNegativeLine || idNegativeLine || vdsPositiveLine || idPositiveLine;

  let channel: Channel | undefined;
  let channelSource: ChannelSource | undefined;
  let signConvention: SweepSignConvention;
  if (declared) {
    channel = declared.channel;
    channelSource = declared.source;
    if (declared.channel === 'n' && negative) {
      const declaredWhere = declared.source === 'file' ? `on line ${declared.line}` : 'by the upload';
      throw new SweepFileError(
        'mixed_signs',
        { file, line: firstSignedLine, field: vdsNegativeLine ? 'VDS' : 'ID', relatedLines: declared.line ? [declared.line] : [] },
        `VDS and ID are negative but the part is declared N-channel ${declaredWhere}`,
        'positive VDS and ID for an N-channel part, or "# channel: p" for a P-channel part',
      );
    }
    signConvention = declared.channel === 'p' && !negative ? 'magnitude' : 'datasheet';
  } else if (negative) {
    channel = 'p';
    channelSource = 'signs';
    signConvention = 'datasheet';
  } else {
    signConvention = 'n-equivalent';
  }
  const flipVgs = channel === 'p';
  const flipVdsId = channel === 'p' && signConvention === 'datasheet';

  const curvesByPart: SweepCurve[][] = [];
  const partFirstLine = new Array<number>(partCount).fill(0);
  const builders: Map<number, CurveBuilder>[] = [];
  for (let p = 0; p < partCount; p++) builders.push(new Map());
  let maxVgs = -Infinity;
  let maxVgsLine = 0;
  for (let i = 0; i < pointCount; i++) {
    const p = raw.partIndex[i];
    const vgs = snapVgs(flipVgs ? -raw.vgsV[i] : raw.vgsV[i]);
    if (vgs > maxVgs) {
      maxVgs = vgs;
      maxVgsLine = raw.line[i];
    }
    partFirstLine[p] ||= raw.line[i];
    let curve = builders[p].get(vgs);
    if (!curve) {
      curve = { vgsV: vgs, column: raw.column[i], vds: [], id: [], line: [] };
      builders[p].set(vgs, curve);
    }
    curve.vds.push(flipVdsId ? noNegativeZero(-raw.vdsV[i]) : raw.vdsV[i]);
    curve.id.push(flipVdsId ? noNegativeZero(-raw.idA[i]) : raw.idA[i]);
    curve.line.push(raw.line[i]);
  }

  const fileVgs = (vgsV: number) => formatVolts(flipVgs ? -vgsV : vgsV);
  const fileVds = (vdsV: number) => formatVolts(flipVdsId ? -vdsV : vdsV);
  checkGateSigns(builders, maxVgs, maxVgsLine, channel, fileVgs, file);

  for (let p = 0; p < partCount; p++) {
    const part = `part "${serials[p]}"`;
    const curves: SweepCurve[] = [];
    for (const b of builders[p].values()) curves.push(finishCurve(b, part, fileVgs, fileVds, file));
    if (curves.length < MIN_CURVES_PER_PART) {
      throw new SweepFileError(
        'too_few_curves',
        { file, line: partFirstLine[p], field: 'VGS' },
        `${part} has ${curves.length} gate step${curves.length === 1 ? '' : 's'} (${curves.map((c) => fileVgs(c.vgsV)).join(', ')})`,
        `at least ${MIN_CURVES_PER_PART} gate steps (distinct VGS values) per part, so that the fit can test the square law`,
      );
    }
    for (const c of curves) {
      if (c.points.vdsV.length < MIN_POINTS_PER_CURVE) {
        throw new SweepFileError(
          'too_few_points',
          { file, line: c.firstLine, field: 'VDS' },
          `${part}, gate step VGS = ${fileVgs(c.vgsV)}, has ${c.points.vdsV.length} point${c.points.vdsV.length === 1 ? '' : 's'}`,
          `at least ${MIN_POINTS_PER_CURVE} points (VDS values) per gate step, covering the linear region and saturation`,
        );
      }
    }
    curves.sort((a, b) => a.vgsV - b.vgsV);
    curvesByPart.push(curves);
  }
  return { channel, channelSource, signConvention, curvesByPart };
}

interface CurveBuilder {
  vgsV: number;
  column: number;
  vds: number[];
  id: number[];
  line: number[];
}

function finishCurve(
  b: CurveBuilder,
  part: string,
  fileVgs: (v: number) => string,
  fileVds: (v: number) => string,
  file: string,
): SweepCurve {
  const n = b.vds.length;
  const order = new Array<number>(n);
  for (let i = 0; i < n; i++) order[i] = i;
  order.sort((i, j) => b.vds[i] - b.vds[j] || b.line[i] - b.line[j]);
  const vdsV = new Array<number>(n);
  const idA = new Array<number>(n);
  const sourceLine = new Array<number>(n);
  let firstLine = Infinity;
  for (let k = 0; k < n; k++) {
    const i = order[k];
    vdsV[k] = b.vds[i];
    idA[k] = b.id[i];
    sourceLine[k] = b.line[i];
    if (b.line[i] < firstLine) firstLine = b.line[i];
    if (k > 0 && vdsV[k] === vdsV[k - 1]) {
      const earlier = Math.min(sourceLine[k], sourceLine[k - 1]);
      const later = Math.max(sourceLine[k], sourceLine[k - 1]);
      throw new SweepFileError(
        'duplicate_point',
        { file, line: later, field: 'VDS', relatedLines: [earlier] },
        `${part} has VGS = ${fileVgs(b.vgsV)}, VDS = ${fileVds(vdsV[k])} twice, on lines ${earlier} and ${later}`,
        'each (VGS, VDS) pair once per part',
      );
    }
  }
  const curve: SweepCurve = { vgsV: b.vgsV, firstLine, points: { vdsV, idA, sourceLine } };
  if (b.column > 0) curve.sourceColumn = b.column;
  return curve;
}

function checkGateSigns(
  builders: Map<number, CurveBuilder>[],
  maxVgs: number,
  maxVgsLine: number,
  channel: Channel | undefined,
  fileVgs: (v: number) => string,
  file: string,
): void {
  let steps = 0;
  let forwardSteps = 0;
  for (const part of builders) {
    for (const vgs of part.keys()) {
      steps++;
      if (vgs > VGS_STEP_RESOLUTION_V) forwardSteps++;
    }
  }
  if (maxVgs <= MAX_FORWARD_VGS_V && forwardSteps * 2 <= steps) return;
  const expected =
    channel === 'p'
      ? 'VGS at or above 0 V for a P-channel part (datasheet sign; also when VDS and ID are given as magnitudes)'
      : channel === 'n'
        ? 'VGS at or below 0 V for an N-channel part'
        : 'VGS at or below 0 V for an N-channel part; for a P-channel part given as positive magnitudes, declare "# channel: p"';
  const what =
    maxVgs > MAX_FORWARD_VGS_V
      ? `VGS = ${fileVgs(maxVgs)} would forward-bias the gate by more than ${MAX_FORWARD_VGS_V} V`
      : `${forwardSteps} of ${steps} gate steps forward-bias the gate (e.g. VGS = ${fileVgs(maxVgs)})`;
  throw new SweepFileError('mixed_signs', { file, line: maxVgsLine, field: 'VGS' }, what, expected);
}

const STEPS_PER_VOLT = Math.round(1 / VGS_STEP_RESOLUTION_V);

function snapVgs(vgsV: number): number {
  if (Math.abs(vgsV) > 1e9) return vgsV;
  return noNegativeZero(Math.round(vgsV * STEPS_PER_VOLT) / STEPS_PER_VOLT);
}

function noNegativeZero(v: number): number {
  return v === 0 ? 0 : v;
}

/** Volts for messages, in the file's own sign, at most 6 significant digits. */
function formatVolts(v: number): string {
  return `${Number(v.toPrecision(6))} V`;
}

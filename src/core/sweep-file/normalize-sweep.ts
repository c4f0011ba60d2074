import type { Channel } from '../jfet-model';
import { SweepFileError } from './errors';
import {
  CUT_OFF_CURVE_FRACTION,
  MAX_FORWARD_VGS_V,
  MAX_NOISE_FLOOR_FRACTION,
  MIN_CURVES_PER_PART,
  MIN_PEAK_ID_A,
  MIN_POINTS_PER_CURVE,
  MIN_POINTS_PER_TRANSFER_CURVE,
  NOISE_FLOOR_SIGMAS,
  SIGN_NOISE_FRACTION,
  VGS_STEP_RESOLUTION_V,
} from './limits';
import type { ChannelSource, SweepCurve, SweepKind, SweepNote, SweepSignConvention, TransferCurve } from './types';

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

export interface NormalizedPart {
  kind: SweepKind;
  /** Sorted by VGS then VDS (N-equivalent). */
  curves: SweepCurve[];
  transferCurves: TransferCurve[];
  notes: SweepNote[];
}

export interface NormalizedSweep {
  channel?: Channel;
  channelSource?: ChannelSource;
  signConvention: SweepSignConvention;
  /** Each part (index as in `partIndex`). */
  parts: NormalizedPart[];
}

/**
 * Decides the sign convention from the signs of VDS and ID and the declared channel, turns
 * every point N-equivalent (see jfet-model.ts), leaves out gate-leak points, groups points
 * into gate steps per part, and checks duplicates and minimum sizes. Signs are judged against
 * each part's own noise floor (`noiseFloorA`). `serials[i]` names part i in messages;
 * `kind` forces every part to be an output family or a transfer sweep (wide layouts say
 * which); otherwise each part's points decide (`partKind`).
 */
export function normalizeSweep(
  raw: RawSweepPoints,
  serials: string[],
  declared: DeclaredChannel | undefined,
  file: string,
  kind?: SweepKind,
): NormalizedSweep {
  const partCount = serials.length;
  const pointCount = raw.vgsV.length;
  const maxAbsVds = new Array<number>(partCount).fill(0);
  const maxAbsId = new Array<number>(partCount).fill(0);
  const maxIdLine = new Array<number>(partCount).fill(0);
  const partFirstLine = new Array<number>(partCount).fill(0);
  for (let i = 0; i < pointCount; i++) {
    const p = raw.partIndex[i];
    partFirstLine[p] ||= raw.line[i];
    maxAbsVds[p] = Math.max(maxAbsVds[p], Math.abs(raw.vdsV[i]));
    if (Math.abs(raw.idA[i]) > maxAbsId[p]) {
      maxAbsId[p] = Math.abs(raw.idA[i]);
      maxIdLine[p] = raw.line[i];
    }
  }
  for (let p = 0; p < partCount; p++) {
    if (maxAbsId[p] < MIN_PEAK_ID_A) {
      throw new SweepFileError(
        'implausible_value',
        { file, line: maxIdLine[p] || partFirstLine[p], field: 'ID' },
        `part "${serials[p]}" never conducts: its largest |ID| is ${formatAmps(maxAbsId[p])}`,
        `a sweep in which the part conducts (a JFET carries at least tens of µA at VGS = 0); check the ID unit in the header (A, mA, uA, nA)`,
      );
    }
  }

  // VDS is a set value: a reading within 0.1 % of the part's largest |VDS| is zero.
  const vdsZero = (i: number) => Math.abs(raw.vdsV[i]) <= SIGN_NOISE_FRACTION * maxAbsVds[raw.partIndex[i]];
  let vdsPositiveLine = 0;
  let vdsNegativeLine = 0;
  for (let i = 0; i < pointCount; i++) {
    if (vdsZero(i)) continue;
    if (raw.vdsV[i] > 0) vdsPositiveLine ||= raw.line[i];
    else vdsNegativeLine ||= raw.line[i];
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

  // The sign the drain current should have: VDS's, or (all VDS zero) that of the largest |ID|.
  let negative = vdsNegativeLine > 0;
  if (!vdsPositiveLine && !vdsNegativeLine) {
    let largest = 0;
    for (let i = 0; i < pointCount; i++) if (Math.abs(raw.idA[i]) > Math.abs(largest)) largest = raw.idA[i];
    negative = largest < 0;
  }

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
        { file, line: vdsNegativeLine || maxIdLine[0], field: vdsNegativeLine ? 'VDS' : 'ID', relatedLines: declared.line ? [declared.line] : [] },
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
  const idSign = negative ? -1 : 1;
  const nVgs = (i: number) => snapVgs(flipVgs ? -raw.vgsV[i] : raw.vgsV[i]);
  const forward = (i: number) => nVgs(i) > VGS_STEP_RESOLUTION_V;

  const noise = noiseFloors(raw, partCount, maxAbsId, vdsZero, forward, nVgs);
  const floors = noise.map((n) => n.floorA);

  // Drain current against the sign it should have: gate leakage, noise or a real conflict.
  const leak = new Uint8Array(pointCount);
  let idWithLine = 0;
  let idAgainstLine = 0;
  for (let i = 0; i < pointCount; i++) {
    const signed = raw.idA[i] * idSign;
    const n = noise[raw.partIndex[i]];
    // The gate diode conducts on a forward step: at VDS = 0, where the channel carries nothing,
    // the drain then reads part of the gate current, against the channel current's sign. A
    // reading beyond the noise seen there (offset + 2σ) is that current.
    if (signed < 0 && forward(i) && vdsZero(i) && -signed > Math.min(n.floorA, n.offsetA + 2 * n.sigmaA)) {
      leak[i] = 1;
      continue;
    }
    if (Math.abs(signed) <= n.floorA) continue;
    if (signed > 0) {
      idWithLine ||= raw.line[i];
      continue;
    }
    idAgainstLine ||= raw.line[i];
  }
  if (idAgainstLine) {
    const floorText = (line: number) => {
      const p = partOfLine(raw, line);
      return `currents within the part's noise floor, ${formatAmps(floors[p])}, may have either sign`;
    };
    if (idWithLine) {
      const positiveLine = negative ? idAgainstLine : idWithLine;
      const negativeLine = negative ? idWithLine : idAgainstLine;
      throw new SweepFileError(
        'mixed_signs',
        { file, line: Math.max(idWithLine, idAgainstLine), field: 'ID', relatedLines: [Math.min(idWithLine, idAgainstLine)] },
        `ID is positive on line ${positiveLine} and negative on line ${negativeLine} (${floorText(idAgainstLine)})`,
        expectedSigns,
      );
    }
    const vdsLine = vdsPositiveLine || vdsNegativeLine;
    throw new SweepFileError(
      'mixed_signs',
      { file, line: Math.max(vdsLine, idAgainstLine), field: 'ID', relatedLines: [Math.min(vdsLine, idAgainstLine)] },
      `VDS is ${negative ? 'negative' : 'positive'} (line ${vdsLine}) but ID is ${negative ? 'positive' : 'negative'} (line ${idAgainstLine})`,
      'VDS and ID with the same sign',
    );
  }

  const builders: Map<number, CurveBuilder>[] = [];
  const leaks: Map<number, { lines: number[]; idA: number[] }>[] = [];
  for (let p = 0; p < partCount; p++) {
    builders.push(new Map());
    leaks.push(new Map());
  }
  let maxVgs = -Infinity;
  let maxVgsLine = 0;
  // Wide transfer format: the column of each fixed VDS.
  const columnOfVds = new Map<number, number>();
  for (let i = 0; i < pointCount; i++) {
    const p = raw.partIndex[i];
    const vgs = nVgs(i);
    const id = flipVdsId ? noNegativeZero(-raw.idA[i]) : raw.idA[i];
    if (vgs > maxVgs) {
      maxVgs = vgs;
      maxVgsLine = raw.line[i];
    }
    if (leak[i]) {
      let l = leaks[p].get(vgs);
      if (!l) leaks[p].set(vgs, (l = { lines: [], idA: [] }));
      l.lines.push(raw.line[i]);
      l.idA.push(id);
      continue;
    }
    if (raw.column[i] > 0) columnOfVds.set(flipVdsId ? noNegativeZero(-raw.vdsV[i]) : raw.vdsV[i], raw.column[i]);
    let curve = builders[p].get(vgs);
    if (!curve) {
      curve = { vgsV: vgs, column: raw.column[i], vds: [], id: [], line: [] };
      builders[p].set(vgs, curve);
    }
    curve.vds.push(flipVdsId ? noNegativeZero(-raw.vdsV[i]) : raw.vdsV[i]);
    curve.id.push(id);
    curve.line.push(raw.line[i]);
  }

  const fileVgs = (vgsV: number) => formatVolts(flipVgs ? -vgsV : vgsV);
  const fileVds = (vdsV: number) => formatVolts(flipVdsId ? -vdsV : vdsV);
  checkGateSigns(builders, maxVgs, maxVgsLine, channel, fileVgs, file);

  const parts: NormalizedPart[] = [];
  for (let p = 0; p < partCount; p++) {
    const part = `part "${serials[p]}"`;
    const notes: SweepNote[] = [];
    for (const [vgsV, l] of [...leaks[p].entries()].sort((a, b) => a[0] - b[0])) {
      notes.push({
        code: 'gate_leakage',
        vgsV,
        lines: l.lines,
        message:
          `Gate step VGS = ${fileVgs(vgsV)} forward-biases the gate: ID at VDS = 0 reads ${l.idA.map(formatAmps).join(', ')} ` +
          `(line ${l.lines.join(', ')}), gate-diode current rather than drain current; left out of the fit.`,
      });
    }
    const curves: SweepCurve[] = [];
    for (const b of builders[p].values()) curves.push(finishCurve(b, part, fileVgs, fileVds, file));
    curves.sort((a, b) => a.vgsV - b.vgsV);
    const partKind = kind ?? kindOfPart(curves);
    if (partKind === 'transfer') {
      parts.push({ kind: 'transfer', curves, transferCurves: transferCurvesOf(curves, part, fileVds, file, partFirstLine[p], columnOfVds), notes });
      continue;
    }
    parts.push({ kind: 'output', curves: checkOutputCurves(curves, part, fileVgs, fileVds, file, partFirstLine[p], maxAbsVds[p], notes), transferCurves: [], notes });
  }
  return { channel, channelSource, signConvention, parts };
}

/**
 * A part's noise floor (A): offset plus `NOISE_FLOOR_SIGMAS` robust standard deviations of the
 * readings that should be zero (VDS = 0 points off forward gate steps, and every point of a
 * cut-off curve), kept between 0.1 % and 5 % of the part's largest |ID|. Without such
 * readings, 0.1 %.
 */
function noiseFloors(
  raw: RawSweepPoints,
  partCount: number,
  maxAbsId: number[],
  vdsZero: (i: number) => boolean,
  forward: (i: number) => boolean,
  nVgs: (i: number) => number,
): { floorA: number; offsetA: number; sigmaA: number }[] {
  const peakByStep: Map<number, number>[] = [];
  for (let p = 0; p < partCount; p++) peakByStep.push(new Map());
  for (let i = 0; i < raw.idA.length; i++) {
    const steps = peakByStep[raw.partIndex[i]];
    const vgs = nVgs(i);
    steps.set(vgs, Math.max(steps.get(vgs) ?? 0, Math.abs(raw.idA[i])));
  }
  const zeros: number[][] = [];
  for (let p = 0; p < partCount; p++) zeros.push([]);
  for (let i = 0; i < raw.idA.length; i++) {
    const p = raw.partIndex[i];
    const cutOff = (peakByStep[p].get(nVgs(i)) ?? 0) <= CUT_OFF_CURVE_FRACTION * maxAbsId[p];
    if (cutOff || (vdsZero(i) && !forward(i))) zeros[p].push(raw.idA[i]);
  }
  return zeros.map((z, p) => {
    const least = SIGN_NOISE_FRACTION * maxAbsId[p];
    if (z.length === 0) return { floorA: least, offsetA: 0, sigmaA: 0 };
    const offset = median(z);
    const sigma = 1.4826 * median(z.map((v) => Math.abs(v - offset)));
    const floor = Math.abs(offset) + NOISE_FLOOR_SIGMAS * sigma;
    return { floorA: Math.min(Math.max(floor, least), MAX_NOISE_FLOOR_FRACTION * maxAbsId[p]), offsetA: Math.abs(offset), sigmaA: sigma };
  });
}

/**
 * A transfer sweep when no gate step has enough points for an output curve and some drain
 * voltage has enough for a transfer curve; otherwise an output family.
 */
function kindOfPart(curves: SweepCurve[]): SweepKind {
  if (curves.some((c) => c.points.vdsV.length >= MIN_POINTS_PER_CURVE)) return 'output';
  const perVds = new Map<number, number>();
  for (const c of curves) for (const v of c.points.vdsV) perVds.set(v, (perVds.get(v) ?? 0) + 1);
  for (const count of perVds.values()) if (count >= MIN_POINTS_PER_TRANSFER_CURVE) return 'transfer';
  return 'output';
}

/**
 * An output family's curves after the short-curve rule: a part needs
 * `MIN_CURVES_PER_PART` gate steps and at least two full curves (`MIN_POINTS_PER_CURVE`
 * points), the least the fit can start from. A shorter curve (typically the top steps, cut
 * by the tracer's power or current limit) is kept when it has a point above VDS = 0, since
 * every such point constrains the fit, and dropped, with a note, when it has none.
 */
function checkOutputCurves(
  all: SweepCurve[],
  part: string,
  fileVgs: (v: number) => string,
  fileVds: (v: number) => string,
  file: string,
  firstLine: number,
  maxAbsVdsV: number,
  notes: SweepNote[],
): SweepCurve[] {
  const full = all.filter((c) => c.points.vdsV.length >= MIN_POINTS_PER_CURVE);
  if (full.length < 2) {
    const short = all.find((c) => c.points.vdsV.length < MIN_POINTS_PER_CURVE);
    if (short && all.length >= MIN_CURVES_PER_PART) {
      throw new SweepFileError(
        'too_few_points',
        { file, line: short.firstLine, field: 'VDS' },
        `${part}, gate step VGS = ${fileVgs(short.vgsV)}, has ${short.points.vdsV.length} point${short.points.vdsV.length === 1 ? '' : 's'}, and ${full.length === 0 ? 'none' : `only ${full.length}`} of its ${all.length} gate steps has ${MIN_POINTS_PER_CURVE} or more`,
        `at least ${MIN_POINTS_PER_CURVE} points (VDS values) on at least 2 gate steps, covering the linear region and saturation; shorter curves are kept beside them`,
      );
    }
  }
  const fullReachV = full.reduce((m, c) => Math.max(m, c.points.vdsV[c.points.vdsV.length - 1]), 0);
  const kept: SweepCurve[] = [];
  for (const c of all) {
    const n = c.points.vdsV.length;
    if (n >= MIN_POINTS_PER_CURVE) {
      kept.push(c);
      continue;
    }
    const reach = c.points.vdsV[n - 1];
    const lines = [...c.points.sourceLine].sort((a, b) => a - b);
    const points = `${n} point${n === 1 ? '' : 's'}`;
    if (!(reach > SIGN_NOISE_FRACTION * maxAbsVdsV)) {
      notes.push({
        code: 'short_curve_dropped',
        vgsV: c.vgsV,
        lines,
        message: `Gate step VGS = ${fileVgs(c.vgsV)} has only ${points}, all at VDS = 0, which tell the fit nothing; the curve was left out.`,
      });
      continue;
    }
    const cut = reach < 0.9 * fullReachV;
    notes.push({
      code: 'short_curve',
      vgsV: c.vgsV,
      lines,
      message: cut
        ? `Gate step VGS = ${fileVgs(c.vgsV)} has only ${points}, up to VDS = ${fileVds(reach)} where the other curves reach ${fileVds(fullReachV)}: cut short, most likely by the tracer's power or current limit. Its points are kept in the fit.`
        : `Gate step VGS = ${fileVgs(c.vgsV)} has only ${points} (fewer than ${MIN_POINTS_PER_CURVE}); its points are kept in the fit.`,
    });
    kept.push(c);
  }
  if (kept.length < MIN_CURVES_PER_PART) {
    throw new SweepFileError(
      'too_few_curves',
      { file, line: firstLine, field: 'VGS' },
      `${part} has ${kept.length} gate step${kept.length === 1 ? '' : 's'}${kept.length ? ` (${kept.map((c) => fileVgs(c.vgsV)).join(', ')})` : ''}${kept.length < all.length ? ` that the fit can use, of ${all.length}` : ''}`,
      `at least ${MIN_CURVES_PER_PART} gate steps (distinct VGS values) per part, so that the fit can test the square law`,
    );
  }
  return kept;
}

/** A transfer sweep's points grouped by VDS; at least one VDS needs `MIN_POINTS_PER_TRANSFER_CURVE` gate voltages. */
function transferCurvesOf(
  curves: SweepCurve[],
  part: string,
  fileVds: (v: number) => string,
  file: string,
  firstLine: number,
  columnOfVds: Map<number, number>,
): TransferCurve[] {
  const byVds = new Map<number, { vgs: number[]; id: number[]; line: number[] }>();
  for (const c of curves) {
    for (let k = 0; k < c.points.vdsV.length; k++) {
      const vds = c.points.vdsV[k];
      let t = byVds.get(vds);
      if (!t) byVds.set(vds, (t = { vgs: [], id: [], line: [] }));
      t.vgs.push(c.vgsV);
      t.id.push(c.points.idA[k]);
      t.line.push(c.points.sourceLine[k]);
    }
  }
  const out: TransferCurve[] = [...byVds.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([vdsV, t]) => {
      const curve: TransferCurve = { vdsV, firstLine: t.line.reduce((m, l) => Math.min(m, l), Infinity), points: { vgsV: t.vgs, idA: t.id, sourceLine: t.line } };
      const column = columnOfVds.get(vdsV);
      if (column !== undefined) curve.sourceColumn = column;
      return curve;
    });
  const longest = out.reduce((m, t) => Math.max(m, t.points.vgsV.length), 0);
  if (longest < MIN_POINTS_PER_TRANSFER_CURVE) {
    throw new SweepFileError(
      'too_few_points',
      { file, line: firstLine, field: 'VGS' },
      `${part} is a transfer sweep whose longest curve has ${longest} gate voltage${longest === 1 ? '' : 's'}${out.length ? ` (at VDS = ${fileVds(out[0].vdsV)})` : ''}`,
      `at least ${MIN_POINTS_PER_TRANSFER_CURVE} gate voltages at one VDS, from pinch-off towards VGS = 0`,
    );
  }
  return out;
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

function median(values: number[]): number {
  const s = Float64Array.from(values).sort();
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

function partOfLine(raw: RawSweepPoints, line: number): number {
  const i = raw.line.indexOf(line);
  return i >= 0 ? raw.partIndex[i] : 0;
}

/** Volts for messages, in the file's own sign, at most 6 significant digits. */
function formatVolts(v: number): string {
  return `${Number(v.toPrecision(6))} V`;
}

const AMP_PREFIXES: [number, string][] = [
  [1, 'A'],
  [1e-3, 'mA'],
  [1e-6, 'µA'],
  [1e-9, 'nA'],
  [1e-12, 'pA'],
];

/** Amperes for messages with an SI prefix and 3 significant digits: "-14.2 µA". */
export function formatAmps(a: number): string {
  if (a === 0) return '0 A';
  const abs = Math.abs(a);
  for (const [scale, unit] of AMP_PREFIXES) if (abs >= scale) return `${Number((a / scale).toPrecision(3))} ${unit}`;
  return `${Number(a.toPrecision(3))} A`;
}

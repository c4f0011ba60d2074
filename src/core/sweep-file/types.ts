import type { Channel } from '../jfet-model';

/** What the caller hands the parser: the decoded text and what it knows about the upload. */
export interface ParseSweepFileInput {
  /** The file decoded as UTF-8; a leading byte-order mark is ignored. */
  text: string;
  /** The original file name; used in messages and as the serial of last resort. */
  fileName: string;
  /** Size of the upload in bytes, checked against MAX_SWEEP_FILE_BYTES before parsing. */
  byteLength: number;
  /** Channel declared by the uploader; must agree with a `# channel:` line if both exist. */
  channel?: Channel;
}

/** `wide-transfer`: one row per VGS, one ID column per fixed VDS (a transfer sweep). */
export type SweepFileFormat = 'long' | 'wide' | 'wide-transfer';

/**
 * What a part's points are: an output family (ID against VDS at a few gate steps) or a
 * transfer sweep (ID against VGS at one or a few fixed VDS).
 */
export type SweepKind = 'output' | 'transfer';

/**
 * How the file's numbers were signed:
 * - `datasheet`: VDS and ID carry the channel's sign (N: positive, P: negative); VGS too.
 * - `magnitude`: a P-channel part given with positive VDS and ID (and positive VGS).
 * - `n-equivalent`: positive VDS and ID with no channel declared: taken as they stand.
 */
export type SweepSignConvention = 'datasheet' | 'magnitude' | 'n-equivalent';

/** Where the channel came from: the caller, a `# channel:` line, or negative VDS and ID. */
export type ChannelSource = 'caller' | 'file' | 'signs';

/** Where a part's serial came from. */
export type SerialSource = 'column' | 'comment' | 'file-name';

/** `# key: value` lines of the file. Known keys are typed; the rest are kept in `extra`. */
export interface SweepMetadata {
  lot?: string;
  deviceType?: string;
  temperatureC?: number;
  station?: string;
  operator?: string;
  /** Other keys, lower-cased with spaces and dashes turned into underscores. */
  extra: Record<string, string>;
}

/**
 * One gate step, N-equivalent signs, SI units (V, A). Points are sorted by VDS; the three
 * arrays are parallel. `sourceLine` holds the 1-based line of each point in the file.
 */
export interface SweepCurve {
  vgsV: number;
  /** Line of the curve's first point in file order (the smallest line number). */
  firstLine: number;
  /** Wide format only: the 1-based column holding this gate step's ID. */
  sourceColumn?: number;
  points: { vdsV: number[]; idA: number[]; sourceLine: number[] };
}

/**
 * One fixed VDS of a transfer sweep, N-equivalent signs, SI units: ID against VGS, sorted by
 * VGS ascending; the arrays are parallel.
 */
export interface TransferCurve {
  vdsV: number;
  firstLine: number;
  /** Wide transfer format only: the 1-based column holding this VDS's ID. */
  sourceColumn?: number;
  points: { vgsV: number[]; idA: number[]; sourceLine: number[] };
}

/**
 * Something the parser did to a part that the uploader should know: a point left out of the
 * fit, a curve kept although short, or one dropped. Shown with the upload and on the part page.
 */
export interface SweepNote {
  code: 'gate_leakage' | 'short_curve' | 'short_curve_dropped';
  /** VGS of the curve concerned (N-equivalent), when it is one curve. */
  vgsV?: number;
  /** Lines of the file the note is about. */
  lines: number[];
  message: string;
}

export interface ParsedSweepPart {
  serial: string;
  serialSource: SerialSource;
  channel?: Channel;
  metadata: SweepMetadata;
  kind: SweepKind;
  /**
   * Every point the fit takes, grouped by VGS and sorted by VGS ascending (N-equivalent):
   * an output family's gate steps; for a transfer sweep, one curve per VGS holding one point
   * per fixed VDS. `fitCurveFamily` takes these as they are.
   */
  curves: SweepCurve[];
  /** The same points of a transfer sweep grouped by VDS, sorted by VDS; empty for an output family. */
  transferCurves: TransferCurve[];
  notes: SweepNote[];
}

export interface ParsedSweepFile {
  fileName: string;
  format: SweepFileFormat;
  delimiter: ',' | ';' | '\t';
  decimalSeparator: '.' | ',';
  headerLine: number;
  channel?: Channel;
  channelSource?: ChannelSource;
  signConvention: SweepSignConvention;
  /** In order of first appearance in the file. */
  parts: ParsedSweepPart[];
  pointCount: number;
}

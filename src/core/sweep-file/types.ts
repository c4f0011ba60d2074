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

export type SweepFileFormat = 'long' | 'wide';

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

export interface ParsedSweepPart {
  serial: string;
  serialSource: SerialSource;
  channel?: Channel;
  metadata: SweepMetadata;
  /** Sorted by VGS ascending (N-equivalent). */
  curves: SweepCurve[];
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

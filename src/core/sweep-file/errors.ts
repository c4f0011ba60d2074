import { AppError } from '../errors';
import { capLength, escapeForMessage, MAX_MESSAGE_LENGTH } from './quote-for-message';

/**
 * The one error the sweep-file parser throws. `code` is permanent (the API and the UI map
 * on it); `message` is the sentence shown to the person who uploaded the file: what was
 * wrong, where (file, line, column and field), and what was expected.
 */

/**
 * - `not_text`: binary, compressed or UTF-16/32 data, or a NUL or other control byte.
 * - `too_large`: the file, its point count or its header is over the limit.
 * - `empty_file`: nothing but whitespace.
 * - `no_header`: no line names any known column (only comments, or data without a header).
 * - `missing_column`: VGS, VDS or ID (or any source of a serial) is missing.
 * - `duplicate_column`: a column is named twice, or ID is given both ways (long and wide).
 * - `bad_header`: a header cell that names a known column cannot be read (wide step label).
 * - `unknown_unit`: a unit in the header that the parser does not know for that quantity.
 * - `ragged_row`: a data row with a different number of cells from the header.
 * - `empty_cell`: a required cell (VGS, VDS, serial; ID in the long format) is empty.
 * - `non_numeric`: a cell that should be a number is not one.
 * - `not_finite`: NaN, Infinity, or a number too large for a double.
 * - `bad_metadata`: a `# key: value` line with a value that cannot be used or that
 *   contradicts another (channel, temperature).
 * - `mixed_signs`: VDS or ID change sign within the file, disagree with each other, or
 *   disagree with the declared channel; or VGS has the wrong sign for the channel.
 * - `duplicate_point`: the same (VGS, VDS) twice for one part.
 * - `too_few_points`: a curve with fewer points than the minimum, or no data rows at all.
 * - `too_few_curves`: a part with fewer gate steps than the minimum.
 * - `implausible_value`: a value no JFET curve tracer produces (|ID| > 10 A, a unit or
 *   scaling mistake, 1e-300), or a part that never conducts.
 * - `bad_serial`: a serial with characters outside the allowed set, or too long.
 */
export type SweepFileErrorCode =
  | 'not_text'
  | 'too_large'
  | 'empty_file'
  | 'no_header'
  | 'missing_column'
  | 'duplicate_column'
  | 'bad_header'
  | 'unknown_unit'
  | 'ragged_row'
  | 'empty_cell'
  | 'non_numeric'
  | 'not_finite'
  | 'bad_metadata'
  | 'mixed_signs'
  | 'duplicate_point'
  | 'too_few_points'
  | 'too_few_curves'
  | 'implausible_value'
  | 'bad_serial';

/** Where a problem is. `line` and `column` are 1-based; `field` names the column. */
export interface SweepFileLocation {
  file: string;
  line?: number;
  column?: number;
  field?: string;
  /** Other lines the message cites (e.g. the first occurrence of a duplicate point). */
  relatedLines?: number[];
}

export class SweepFileError extends AppError<SweepFileErrorCode> {
  override readonly name = 'SweepFileError';
  readonly file: string;
  readonly line: number | undefined;
  readonly column: number | undefined;
  readonly field: string | undefined;
  readonly relatedLines: number[];
  /** What was wrong, without the location. */
  readonly problem: string;
  /** What the parser expected instead. */
  readonly expected: string;

  constructor(
    code: SweepFileErrorCode,
    location: SweepFileLocation,
    problem: string,
    expected: string,
  ) {
    // File names, header labels and values come from the upload: escaped and capped here, so
    // no message carries a control character raw or grows with the file.
    super(
      code,
      { where: describeLocation(location), problem, expected },
      { file: location.file, line: location.line, column: location.column, field: location.field, related_lines: location.relatedLines },
    );
    this.message = capLength(escapeForMessage(this.message), MAX_MESSAGE_LENGTH);
    this.file = location.file;
    this.line = location.line;
    this.column = location.column;
    this.field = location.field;
    this.relatedLines = location.relatedLines ?? [];
    this.problem = problem;
    this.expected = expected;
  }
}

/** "lot7.csv, line 12, column 3 (ID)" */
export function describeLocation(location: SweepFileLocation): string {
  let text = capLength(location.file, 160);
  if (location.line !== undefined) text += `, line ${location.line}`;
  if (location.column !== undefined) text += `, column ${location.column}`;
  if (location.field !== undefined) text += ` (${capLength(location.field, 60)})`;
  return text;
}

export function isSweepFileError(value: unknown): value is SweepFileError {
  return value instanceof SweepFileError;
}

import type { Channel } from '../jfet-model';
import { normalizeSerial, serialProblem, SERIAL_RULE } from '../serial/normalize-serial';
import { SweepFileError } from './errors';
import {
  MAX_ABS_ID_A,
  MAX_ABS_VDS_V,
  MAX_ABS_VGS_V,
  MAX_SWEEP_FILE_BYTES,
  MAX_SWEEP_POINTS_PER_FILE,
} from './limits';
import { quoteForMessage } from './quote-for-message';
import { normalizeSweep, type DeclaredChannel, type RawSweepPoints } from './normalize-sweep';
import { readNumberCell, type NumberCellProblem } from './read-number-cell';
import { readSweepHeader, type NumericColumn, type SweepHeaderLayout } from './read-sweep-header';
import { interpretSweepMetadata, readMetadataComment, type MetadataEntry } from './read-sweep-metadata';
import { detectDelimiter, splitDelimitedLine } from './split-delimited-line';
import type { ParsedSweepFile, ParsedSweepPart, ParseSweepFileInput, SerialSource, SweepKind } from './types';

const MIB = 1024 * 1024;

/**
 * Parses one curve-tracer sweep file (formats in FORMATS.md) into parts with N-equivalent
 * curve families in SI units. Throws only `SweepFileError`; never returns NaN or Infinity.
 */
export function parseSweepFile(input: ParseSweepFileInput): ParsedSweepFile {
  const file = input.fileName.trim() === '' ? '(unnamed file)' : input.fileName;
  const byteLength = Number.isFinite(input.byteLength) ? input.byteLength : 0;
  const size = Math.max(byteLength, input.text.length);
  if (size > MAX_SWEEP_FILE_BYTES) {
    throw new SweepFileError(
      'too_large',
      { file },
      `the file is ${size} bytes, over the limit of ${MAX_SWEEP_FILE_BYTES} bytes (${MAX_SWEEP_FILE_BYTES / MIB} MiB)`,
      `a file of at most ${MAX_SWEEP_FILE_BYTES / MIB} MiB; split the sweeps into several files`,
    );
  }
  const text = input.text.charCodeAt(0) === 0xfeff ? input.text.slice(1) : input.text;
  const nul = text.indexOf('\u0000');
  if (nul >= 0) {
    throw new SweepFileError(
      'not_text',
      { file, line: text.slice(0, nul).split(/\r\n|\r|\n/).length },
      'this looks like binary data, not text: it contains a NUL character',
      'a plain-text CSV or TSV file in UTF-8',
    );
  }
  if (text.trim() === '') {
    throw new SweepFileError('empty_file', { file }, 'the file is empty', 'a header row and rows of VGS, VDS and ID values (see the sweep file formats)');
  }

  const lines = text.split(/\r\n|\r|\n/);
  const comments: MetadataEntry[] = [];
  let headerLineIndex = -1;
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i];
    const kind = classifyLine(line);
    if (kind === 'blank') continue;
    if (kind === 'comment') {
      const entry = readMetadataComment(line, i + 1);
      if (entry) comments.push(entry);
      continue;
    }
    headerLineIndex = i;
    break;
  }
  if (headerLineIndex < 0) {
    throw new SweepFileError(
      'no_header',
      { file },
      'the file has only comment lines',
      'a header row such as "vgs (V),vds (V),id (mA)" followed by data rows',
    );
  }

  const headerLineNumber = headerLineIndex + 1;
  const delimiter = detectDelimiter(lines[headerLineIndex]);
  const decimalComma = delimiter === ';' || delimiter === '\t';
  const layout = readSweepHeader(splitDelimitedLine(lines[headerLineIndex], delimiter), {
    file,
    line: headerLineNumber,
    decimalComma,
  });

  if (layout.format !== 'long') {
    for (const step of layout.steps) {
      checkPlausible(step.vgsV, layout.format === 'wide' ? 'VGS' : 'VDS', String(step.vgsV), { ...step, powerOfTen: 0 }, headerLineNumber, file);
    }
  }

  const raw: RawSweepPoints = { partIndex: [], vgsV: [], vdsV: [], idA: [], line: [], column: [] };
  const serials: string[] = [];
  // By the cell as written, then by the normalized serial ("jx-1" and "JX-1" are one part).
  const partBySerial = new Map<string, number>();
  const partByNormalSerial = new Map<string, number>();
  let dataRows = 0;
  for (let i = headerLineIndex + 1; i < lines.length; i++) {
    const line = lines[i];
    const kind = classifyLine(line);
    if (kind === 'blank') continue;
    const lineNumber = i + 1;
    if (kind === 'comment') {
      const entry = readMetadataComment(line, lineNumber);
      if (entry) comments.push(entry);
      continue;
    }
    const cells = splitDelimitedLine(line, delimiter);
    if (allBlank(cells)) continue;
    if (cells.length !== layout.cellCount) {
      throw new SweepFileError(
        'ragged_row',
        { file, line: lineNumber },
        `the row has ${cells.length} cell${cells.length === 1 ? '' : 's'} but the header (line ${headerLineNumber}) has ${layout.cellCount}`,
        `${layout.cellCount} cells separated by "${delimiter === '\t' ? 'tab' : delimiter}", as in the header`,
      );
    }
    dataRows++;
    let partIndex = 0;
    if (layout.serialIndex !== undefined) {
      const cell = cells[layout.serialIndex];
      let known = partBySerial.get(cell);
      if (known === undefined) {
        const where = { file, line: lineNumber, column: layout.serialIndex + 1, field: 'serial' };
        const serial = normalizeSerial(cell);
        if (serial === '') {
          throw new SweepFileError('empty_cell', where, 'the serial is empty', 'the serial of the part measured on this row');
        }
        checkSerial(serial, cell, where);
        known = partByNormalSerial.get(serial);
        if (known === undefined) {
          known = serials.length;
          serials.push(serial);
          partByNormalSerial.set(serial, known);
        }
        partBySerial.set(cell, known);
      }
      partIndex = known;
    }
    addRowPoints(raw, layout, cells, partIndex, lineNumber, decimalComma, file);
    if (raw.vgsV.length > MAX_SWEEP_POINTS_PER_FILE) {
      throw new SweepFileError(
        'too_large',
        { file, line: lineNumber },
        `the file has more than ${MAX_SWEEP_POINTS_PER_FILE} points`,
        `at most ${MAX_SWEEP_POINTS_PER_FILE} points per file; split the sweeps into several files`,
      );
    }
  }
  if (dataRows === 0) {
    throw new SweepFileError(
      'too_few_points',
      { file, line: headerLineNumber },
      'the file has a header but no data rows',
      'rows of values under the header',
    );
  }

  const fileMetadata = interpretSweepMetadata(comments, { file, decimalComma });
  let serialSource: SerialSource = 'column';
  if (layout.serialIndex === undefined) {
    const fromName = serialFromFileName(input.fileName);
    serialSource = fileMetadata.serial ? 'comment' : 'file-name';
    const written = fileMetadata.serial?.value ?? fromName;
    const serial = normalizeSerial(written);
    if (serial === '') {
      throw new SweepFileError(
        'missing_column',
        { file, field: 'serial' },
        'the part has no serial: no serial column, no "# serial:" line, and no file name to use',
        'a "serial" column, a "# serial: <serial>" line, or a file named after the part',
      );
    }
    checkSerial(
      serial,
      written,
      fileMetadata.serial ? { file, line: fileMetadata.serial.line, field: 'serial' } : { file, field: 'serial (from the file name)' },
    );
    serials.push(serial);
  }

  const declared = declaredChannel(input.channel, fileMetadata.channel, file);
  const kind: SweepKind | undefined = layout.format === 'wide-transfer' ? 'transfer' : layout.format === 'wide' ? 'output' : fileMetadata.sweepKind;
  const normalized = normalizeSweep(raw, serials, declared, file, kind);
  const parts: ParsedSweepPart[] = serials.map((serial, p) => {
    const n = normalized.parts[p];
    const part: ParsedSweepPart = {
      serial,
      serialSource,
      metadata: { ...fileMetadata.metadata, extra: { ...fileMetadata.metadata.extra } },
      kind: n.kind,
      curves: n.curves,
      transferCurves: n.transferCurves,
      notes: n.notes,
    };
    if (normalized.channel) part.channel = normalized.channel;
    return part;
  });

  const result: ParsedSweepFile = {
    fileName: input.fileName,
    format: layout.format,
    delimiter: delimiter ?? ',',
    decimalSeparator: decimalComma ? ',' : '.',
    headerLine: headerLineNumber,
    signConvention: normalized.signConvention,
    parts,
    pointCount: raw.vgsV.length,
  };
  if (normalized.channel) result.channel = normalized.channel;
  if (normalized.channelSource) result.channelSource = normalized.channelSource;
  return result;
}

function classifyLine(line: string): 'blank' | 'comment' | 'data' {
  for (let i = 0; i < line.length; i++) {
    const c = line[i];
    if (c === ' ' || c === '\t') continue;
    return c === '#' ? 'comment' : 'data';
  }
  return 'blank';
}

function allBlank(cells: string[]): boolean {
  for (const cell of cells) {
    for (let i = 0; i < cell.length; i++) {
      const c = cell.charCodeAt(i);
      if (c !== 32 && c !== 9) return false;
    }
  }
  return true;
}

function addRowPoints(
  raw: RawSweepPoints,
  layout: SweepHeaderLayout,
  cells: string[],
  partIndex: number,
  lineNumber: number,
  decimalComma: boolean,
  file: string,
): void {
  if (layout.format === 'wide-transfer') {
    const vgsV = readRequired(cells, layout.vgs, 'VGS', lineNumber, decimalComma, file);
    checkPlausible(vgsV, 'VGS', cells[layout.vgs.index], layout.vgs, lineNumber, file);
    for (const step of layout.steps) {
      const value = readNumberCell(cells[step.index], decimalComma, step.powerOfTen);
      if (value === 'empty') continue;
      if (typeof value !== 'number') throw cellError(value, cells[step.index], step, 'ID', lineNumber, file);
      checkPlausible(value, 'ID', cells[step.index], step, lineNumber, file);
      pushPoint(raw, partIndex, vgsV, step.vgsV, value, lineNumber, step.index + 1);
    }
    return;
  }
  const vdsV = readRequired(cells, layout.vds, 'VDS', lineNumber, decimalComma, file);
  checkPlausible(vdsV, 'VDS', cells[layout.vds.index], layout.vds, lineNumber, file);
  if (layout.format === 'long') {
    const vgsV = readRequired(cells, layout.vgs, 'VGS', lineNumber, decimalComma, file);
    const idA = readRequired(cells, layout.id, 'ID', lineNumber, decimalComma, file);
    checkPlausible(vgsV, 'VGS', cells[layout.vgs.index], layout.vgs, lineNumber, file);
    checkPlausible(idA, 'ID', cells[layout.id.index], layout.id, lineNumber, file);
    pushPoint(raw, partIndex, vgsV, vdsV, idA, lineNumber, 0);
    return;
  }
  for (const step of layout.steps) {
    const value = readNumberCell(cells[step.index], decimalComma, step.powerOfTen);
    if (value === 'empty') continue;
    if (typeof value !== 'number') throw cellError(value, cells[step.index], step, 'ID', lineNumber, file);
    checkPlausible(value, 'ID', cells[step.index], step, lineNumber, file);
    pushPoint(raw, partIndex, step.vgsV, vdsV, value, lineNumber, step.index + 1);
  }
}

const MAX_MAGNITUDE = { VGS: MAX_ABS_VGS_V, VDS: MAX_ABS_VDS_V, ID: MAX_ABS_ID_A } as const;
const UNIT = { VGS: 'V', VDS: 'V', ID: 'A' } as const;

/** Refuses a value no JFET curve tracer produces (limits.ts, FORMATS.md "Plausibility"). */
function checkPlausible(
  value: number,
  quantity: 'VGS' | 'VDS' | 'ID',
  cell: string,
  column: NumericColumn,
  line: number,
  file: string,
): void {
  const max = MAX_MAGNITUDE[quantity];
  if (Math.abs(value) <= max) return;
  const location = { file, line, column: column.index + 1, field: column.label };
  const written = `"${quoteForMessage(cell.trim())}"${column.powerOfTen !== 0 ? ` (${Number(value.toPrecision(6))} ${UNIT[quantity]})` : ''}`;
  throw new SweepFileError(
    'implausible_value',
    location,
    `${quantity} is ${written}, beyond the ${max} ${UNIT[quantity]} a JFET curve tracer can produce`,
    `|${quantity}| of at most ${max} ${UNIT[quantity]}; check the unit in the header (${quantity === 'ID' ? 'A, mA, uA, nA' : 'V, mV'}) and any scaling of the file`,
  );
}

function checkSerial(serial: string, written: string, where: { file: string; line?: number; column?: number; field: string }): void {
  const problem = serialProblem(serial);
  if (problem === null) return;
  throw new SweepFileError('bad_serial', where, `the serial "${quoteForMessage(written.trim())}" ${problem}`, `a serial of ${SERIAL_RULE}`);
}

function pushPoint(
  raw: RawSweepPoints,
  partIndex: number,
  vgsV: number,
  vdsV: number,
  idA: number,
  line: number,
  column: number,
): void {
  raw.partIndex.push(partIndex);
  raw.vgsV.push(vgsV);
  raw.vdsV.push(vdsV);
  raw.idA.push(idA);
  raw.line.push(line);
  raw.column.push(column);
}

function readRequired(
  cells: string[],
  column: NumericColumn,
  quantity: string,
  lineNumber: number,
  decimalComma: boolean,
  file: string,
): number {
  const value = readNumberCell(cells[column.index], decimalComma, column.powerOfTen);
  if (typeof value === 'number') return value;
  throw cellError(value, cells[column.index], column, quantity, lineNumber, file);
}

function cellError(
  problem: NumberCellProblem,
  cell: string,
  column: NumericColumn,
  quantity: string,
  line: number,
  file: string,
): SweepFileError {
  const location = { file, line, column: column.index + 1, field: column.label };
  const number = 'a decimal number such as -0.5 or 1.2e-3';
  if (problem === 'empty') return new SweepFileError('empty_cell', location, `the ${quantity} cell is empty`, number);
  const shown = quoteForMessage(cell.trim());
  if (problem === 'not_finite') {
    return new SweepFileError('not_finite', location, `${quantity} is "${shown}", which is not a finite number`, `${number}; leave out points that were not measured`);
  }
  return new SweepFileError('non_numeric', location, `${quantity} is "${shown}", which is not a number`, number);
}

function declaredChannel(
  fromCaller: Channel | undefined,
  fromFile: { value: Channel; line: number } | undefined,
  file: string,
): DeclaredChannel | undefined {
  const caller = fromCaller === 'n' || fromCaller === 'p' ? fromCaller : undefined;
  if (caller && fromFile && caller !== fromFile.value) {
    throw new SweepFileError(
      'bad_metadata',
      { file, line: fromFile.line, field: 'channel' },
      `the file declares channel "${fromFile.value}" but the upload declares "${caller}"`,
      'the same channel in the file and in the upload, or in only one of them',
    );
  }
  if (caller) return { channel: caller, source: 'caller' };
  if (fromFile) return { channel: fromFile.value, source: 'file', line: fromFile.line };
  return undefined;
}

/** The file name without folders and without its last extension: "lot7/JX-12.csv" → "JX-12". */
function serialFromFileName(fileName: string): string {
  const base = fileName.slice(Math.max(fileName.lastIndexOf('/'), fileName.lastIndexOf('\\')) + 1);
  const dot = base.lastIndexOf('.');
  return (dot >= 0 ? base.slice(0, dot) : base).trim();
}

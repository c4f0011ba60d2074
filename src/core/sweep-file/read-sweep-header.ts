import { SweepFileError } from './errors';
import { MAX_GATE_STEP_COLUMNS, MAX_HEADER_CELLS } from './limits';
import { quoteForMessage } from './quote-for-message';
import { readNumberCell } from './read-number-cell';

/** A numeric column: its 0-based index, the header text, and its unit as a power of ten. */
export interface NumericColumn {
  index: number;
  label: string;
  /** SI value = cell value × 10^powerOfTen (mA: -3). */
  powerOfTen: number;
}

/** A wide-format ID column: one gate step (output family) or one drain voltage (transfer sweep). */
export interface GateStepColumn extends NumericColumn {
  /** The step's fixed voltage: VGS in an output family, VDS in a transfer sweep. */
  vgsV: number;
}

export type SweepHeaderLayout =
  | {
      format: 'long';
      cellCount: number;
      serialIndex?: number;
      vgs: NumericColumn;
      vds: NumericColumn;
      id: NumericColumn;
    }
  | {
      format: 'wide';
      cellCount: number;
      serialIndex?: number;
      vds: NumericColumn;
      steps: GateStepColumn[];
    }
  | {
      /** Transfer sweep, one row per VGS: a VGS column and one ID column per fixed VDS. */
      format: 'wide-transfer';
      cellCount: number;
      serialIndex?: number;
      vgs: NumericColumn;
      /** `vgsV` of each holds the column's VDS. */
      steps: GateStepColumn[];
    };

type Quantity = 'vgs' | 'vds' | 'id';

const VOLTAGE_POWERS: Record<string, number> = { v: 0, mv: -3 };
const CURRENT_POWERS: Record<string, number> = { a: 0, ma: -3, ua: -6, 'µa': -6, 'μa': -6, na: -9 };
const VOLTAGE_UNITS = 'V or mV';
const CURRENT_UNITS = 'A, mA, uA (µA) or nA';
const SERIAL_NAMES = new Set(['serial', 'serial number', 'serial_number', 'serial no', 'serial no.']);
const NAME_END = new Set([' ', '_', '(', '[', '/']);
export const WIDE_HEADER_EXAMPLE = 'id_mA@vgs=-0.5 or ID (mA) @ VGS=-0.5 V';
export const TRANSFER_HEADER_EXAMPLE = 'id_mA@vds=10 or ID (mA) @ VDS=10 V';

interface HeaderContext {
  file: string;
  line: number;
  decimalComma: boolean;
}

/**
 * Reads the header row. Long format: VGS, VDS and ID columns. Wide format: a VDS column and
 * one `<ID column> @ VGS=<value>[V|mV]` column per gate step. Optional `serial` column.
 * Names match case-insensitively; units follow the name as `(mA)`, `[mA]`, `_mA`, `/mA` or
 * ` mA` and default to V and A. Cells naming nothing known are ignored.
 */
export function readSweepHeader(cells: string[], context: HeaderContext): SweepHeaderLayout {
  const found: Partial<Record<Quantity, NumericColumn>> = {};
  const steps: GateStepColumn[] = [];
  // Step value → column, so that finding a repeated step is one lookup (a header may be long).
  const stepByValue = new Map<number, GateStepColumn>();
  let stepQuantity: 'vgs' | 'vds' | undefined;
  let serialIndex: number | undefined;
  const at = (index: number, label: string) => ({
    file: context.file,
    line: context.line,
    column: index + 1,
    field: label,
  });
  if (cells.length > MAX_HEADER_CELLS) {
    throw new SweepFileError(
      'too_large',
      { file: context.file, line: context.line },
      `the header has ${cells.length} columns, over the limit of ${MAX_HEADER_CELLS}`,
      `at most ${MAX_HEADER_CELLS} columns, of which at most ${MAX_GATE_STEP_COLUMNS} per-step ID columns; split the sweeps into several files`,
    );
  }

  for (let index = 0; index < cells.length; index++) {
    const label = cells[index].trim();
    const lower = label.toLowerCase();
    if (lower.length === 0) continue;
    if (SERIAL_NAMES.has(lower)) {
      if (serialIndex !== undefined) {
        throw new SweepFileError(
          'duplicate_column',
          at(index, label),
          `the serial column appears twice (columns ${serialIndex + 1} and ${index + 1})`,
          'one serial column',
        );
      }
      serialIndex = index;
      continue;
    }
    const atSign = label.indexOf('@');
    if (atSign >= 0) {
      const idPart = label.slice(0, atSign);
      const name = readQuantityName(idPart.trim());
      if (name?.quantity !== 'id') continue;
      const powerOfTen = readUnit('id', name.unitText, at(index, label));
      const step = readStepLabel(label.slice(atSign + 1), at(index, label), context.decimalComma);
      if (stepQuantity !== undefined && step.quantity !== stepQuantity) {
        throw new SweepFileError(
          'bad_header',
          at(index, label),
          `the header mixes ID columns per gate step ("@vgs=") with ID columns per drain voltage ("@vds=")`,
          `either "${WIDE_HEADER_EXAMPLE}" columns (output family) or "${TRANSFER_HEADER_EXAMPLE}" columns (transfer sweep), not both in one file`,
        );
      }
      stepQuantity = step.quantity;
      const twin = stepByValue.get(step.valueV);
      if (twin) {
        const what = step.quantity === 'vgs' ? 'gate step VGS' : 'drain voltage VDS';
        throw new SweepFileError(
          'duplicate_column',
          at(index, label),
          `${what} = ${step.valueV} V appears twice (columns ${twin.index + 1} and ${index + 1})`,
          `one ID column per ${step.quantity === 'vgs' ? 'gate step' : 'drain voltage'}`,
        );
      }
      if (steps.length >= MAX_GATE_STEP_COLUMNS) {
        throw new SweepFileError(
          'too_large',
          at(index, label),
          `the header has more than ${MAX_GATE_STEP_COLUMNS} per-step ID columns`,
          `at most ${MAX_GATE_STEP_COLUMNS} ${step.quantity === 'vgs' ? 'gate steps' : 'drain voltages'} per file (a tracer steps the gate 5 to 20 times); split the sweeps into several files`,
        );
      }
      const column = { index, label, powerOfTen, vgsV: step.valueV };
      stepByValue.set(step.valueV, column);
      steps.push(column);
      continue;
    }
    const name = readQuantityName(label);
    if (!name) continue;
    const previous = found[name.quantity];
    if (previous) {
      throw new SweepFileError(
        'duplicate_column',
        at(index, label),
        `${quantityLabel(name.quantity)} is named twice (columns ${previous.index + 1} and ${index + 1})`,
        `one ${quantityLabel(name.quantity)} column`,
      );
    }
    found[name.quantity] = { index, label, powerOfTen: readUnit(name.quantity, name.unitText, at(index, label)) };
  }

  const where = { file: context.file, line: context.line };
  const columnList = () => truncate(cells.slice(0, 12).map((c) => `"${quoteForMessage(c.trim(), 30)}"`).join(', ') + (cells.length > 12 ? ', ...' : ''));
  if (!found.vgs && !found.vds && !found.id && steps.length === 0) {
    throw new SweepFileError(
      'no_header',
      where,
      `the first line that is not a comment names none of the columns VGS, VDS or ID (found ${columnList()})`,
      `a header row such as "vgs (V),vds (V),id (mA)" before the data, or "vds (V),${WIDE_HEADER_EXAMPLE.split(' or ')[0]},..." for one column per gate step`,
    );
  }
  if (stepQuantity === 'vds') {
    if (found.id || found.vds) {
      const plain = (found.id ?? found.vds)!;
      throw new SweepFileError(
        'duplicate_column',
        at(plain.index, plain.label),
        `the header mixes a plain ${found.id ? 'ID' : 'VDS'} column with per-drain-voltage ID columns (column ${steps[0].index + 1})`,
        `either VGS, VDS and ID columns (long format) or VGS and one "${TRANSFER_HEADER_EXAMPLE}" column per drain voltage (transfer sweep)`,
      );
    }
    if (!found.vgs) {
      throw new SweepFileError(
        'missing_column',
        { ...where, field: 'VGS' },
        `the header has ID columns per drain voltage but no VGS column (found ${columnList()})`,
        'a column named VGS, e.g. "vgs (V)", holding the gate voltage of each row',
      );
    }
    return { format: 'wide-transfer', cellCount: cells.length, serialIndex, vgs: found.vgs, steps };
  }
  if (!found.vds) {
    throw new SweepFileError(
      'missing_column',
      { ...where, field: 'VDS' },
      `the header has no VDS column (found ${columnList()})`,
      'a column named VDS, e.g. "vds (V)"',
    );
  }
  if (steps.length > 0) {
    if (found.id || found.vgs) {
      const plain = (found.id ?? found.vgs)!;
      throw new SweepFileError(
        'duplicate_column',
        at(plain.index, plain.label),
        `the header mixes a plain ${found.id ? 'ID' : 'VGS'} column with per-gate-step ID columns (column ${steps[0].index + 1})`,
        `either VGS, VDS and ID columns (long format) or VDS and one "${WIDE_HEADER_EXAMPLE}" column per gate step (wide format)`,
      );
    }
    return { format: 'wide', cellCount: cells.length, serialIndex, vds: found.vds, steps };
  }
  if (!found.vgs) {
    throw new SweepFileError(
      'missing_column',
      { ...where, field: 'VGS' },
      `the header has no VGS column (found ${columnList()})`,
      `a column named VGS, e.g. "vgs (V)", or one ID column per gate step such as "${WIDE_HEADER_EXAMPLE}"`,
    );
  }
  if (!found.id) {
    throw new SweepFileError(
      'missing_column',
      { ...where, field: 'ID' },
      `the header has no ID column (found ${columnList()})`,
      'a column named ID, e.g. "id (mA)"',
    );
  }
  return { format: 'long', cellCount: cells.length, serialIndex, vgs: found.vgs, vds: found.vds, id: found.id };
}

/** `label` is trimmed; the returned unit text keeps its case for messages. */
function readQuantityName(label: string): { quantity: Quantity; unitText: string } | undefined {
  const lower = label.toLowerCase();
  for (const quantity of ['vgs', 'vds', 'id'] as const) {
    if (!lower.startsWith(quantity)) continue;
    if (lower.length > quantity.length && !NAME_END.has(lower[quantity.length])) continue;
    return { quantity, unitText: label.slice(quantity.length) };
  }
  return undefined;
}

function readUnit(
  quantity: Quantity,
  unitText: string,
  location: { file: string; line: number; column: number; field: string },
): number {
  let text = unitText.trim().toLowerCase();
  if (text.startsWith('_') || text.startsWith('/')) text = text.slice(1).trim();
  if (text.startsWith('(') && text.endsWith(')')) text = text.slice(1, -1).trim();
  else if (text.startsWith('[') && text.endsWith(']')) text = text.slice(1, -1).trim();
  const table = quantity === 'id' ? CURRENT_POWERS : VOLTAGE_POWERS;
  if (text === '') return 0;
  const power = Object.hasOwn(table, text) ? table[text] : undefined;
  if (power !== undefined) return power;
  throw new SweepFileError(
    'unknown_unit',
    location,
    `unknown unit "${quoteForMessage(unitText.trim().replace(/^[_/]/, '').trim())}" for ${quantityLabel(quantity)}`,
    `${quantity === 'id' ? CURRENT_UNITS : VOLTAGE_UNITS}, written as in "${quantity === 'id' ? 'id (mA)' : `${quantity} (V)`}", or no unit for ${quantity === 'id' ? 'A' : 'V'}`,
  );
}

/** Reads `VGS=<number>[V|mV]` or `VDS=<number>[V|mV]` (blanks allowed around `=`), in volts. */
function readStepLabel(
  text: string,
  location: { file: string; line: number; column: number; field: string },
  decimalComma: boolean,
): { quantity: 'vgs' | 'vds'; valueV: number } {
  const expected = `"<ID column>@vgs=<number>" (output family) or "<ID column>@vds=<number>" (transfer sweep) with an optional V or mV after the number, e.g. ${WIDE_HEADER_EXAMPLE}`;
  const t = text.trim().toLowerCase();
  const equals = t.indexOf('=');
  const quantity = t.startsWith('vgs') ? 'vgs' : t.startsWith('vds') ? 'vds' : undefined;
  if (!quantity || equals < 0 || t.slice(3, equals).trim() !== '') {
    throw new SweepFileError('bad_header', location, `the step after "@" is not "vgs=<value>" or "vds=<value>"`, expected);
  }
  const valueAndUnit = t.slice(equals + 1).trim();
  let unitStart = valueAndUnit.length;
  while (unitStart > 0 && isUnitLetter(valueAndUnit[unitStart - 1])) unitStart--;
  const unit = valueAndUnit.slice(unitStart);
  const name = quantity === 'vgs' ? 'the gate step VGS' : 'the drain voltage VDS';
  if (unit !== '' && unit !== 'v' && unit !== 'mv') {
    throw new SweepFileError('unknown_unit', location, `unknown unit "${quoteForMessage(unit)}" for ${name}`, `V or mV after the number, e.g. ${quantity === 'vgs' ? WIDE_HEADER_EXAMPLE : TRANSFER_HEADER_EXAMPLE}`);
  }
  const value = readNumberCell(valueAndUnit.slice(0, unitStart), decimalComma, unit === 'mv' ? -3 : 0);
  if (typeof value !== 'number') {
    throw new SweepFileError(
      'bad_header',
      location,
      `the ${quantity === 'vgs' ? 'gate step' : 'drain voltage'} value "${quoteForMessage(valueAndUnit.slice(0, unitStart).trim())}" is not a number`,
      expected,
    );
  }
  return { quantity, valueV: value };
}

function isUnitLetter(c: string): boolean {
  return (c >= 'a' && c <= 'z') || c === 'µ' || c === 'μ';
}

function quantityLabel(quantity: Quantity): string {
  return quantity.toUpperCase();
}

function truncate(text: string): string {
  return text.length > 120 ? `${text.slice(0, 117)}...` : text;
}

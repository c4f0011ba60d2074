import type { Channel } from '../jfet-model';
import { SweepFileError } from './errors';
import { MAX_TEMPERATURE_C, MIN_TEMPERATURE_C } from './limits';
import { quoteForMessage } from './quote-for-message';
import { readNumberCell } from './read-number-cell';
import type { SweepKind, SweepMetadata } from './types';

/** One `# key: value` line, key already normalized. */
export interface MetadataEntry {
  key: string;
  value: string;
  line: number;
}

export interface FileMetadata {
  metadata: SweepMetadata;
  serial?: { value: string; line: number };
  channel?: { value: Channel; line: number };
  /** `# sweep: output` or `# sweep: transfer`; otherwise the points decide. */
  sweepKind?: SweepKind;
}

const KEY_ALIASES: Record<string, string> = {
  device_type: 'device_type',
  devicetype: 'device_type',
  type: 'device_type',
  temperature_c: 'temperature_c',
  temperature: 'temperature_c',
  temp_c: 'temperature_c',
  'temperature_(c)': 'temperature_c',
  'temperature_(°c)': 'temperature_c',
  serial_number: 'serial',
  serial_no: 'serial',
  sweep_type: 'sweep',
  measurement: 'sweep',
};

/**
 * Reads a comment line (`#` first after blanks). `# key: value` gives an entry; a comment
 * without a colon, or with an empty key or value, gives nothing. Keys are lower-cased, runs
 * of blanks and dashes become `_`, and a few aliases map to one name (`device type` and
 * `type` → `device_type`, `temperature` → `temperature_c`).
 */
export function readMetadataComment(line: string, lineNumber: number): MetadataEntry | undefined {
  const hash = line.indexOf('#');
  const colon = line.indexOf(':', hash + 1);
  if (colon < 0) return undefined;
  const rawKey = line.slice(hash + 1, colon).trim().toLowerCase();
  const value = line.slice(colon + 1).trim();
  if (rawKey === '' || value === '') return undefined;
  let key = '';
  let pendingUnderscore = false;
  for (const c of rawKey) {
    if (c === ' ' || c === '\t' || c === '-' || c === '_') pendingUnderscore = key.length > 0;
    else {
      if (pendingUnderscore) key += '_';
      pendingUnderscore = false;
      key += c;
    }
  }
  if (key === '') return undefined;
  return { key: Object.hasOwn(KEY_ALIASES, key) ? KEY_ALIASES[key] : key, value, line: lineNumber };
}

/**
 * Turns the file's entries into metadata. A key given twice must have the same value.
 * `channel` accepts n, p, n-channel, p-channel, njf, pjf (any case); `temperature_c` a
 * number with an optional `C` or `°C` after it.
 */
export function interpretSweepMetadata(
  entries: MetadataEntry[],
  context: { file: string; decimalComma: boolean },
): FileMetadata {
  const seen = new Map<string, MetadataEntry>();
  for (const entry of entries) {
    const first = seen.get(entry.key);
    if (!first) seen.set(entry.key, entry);
    else if (first.value !== entry.value) {
      throw new SweepFileError(
        'bad_metadata',
        { file: context.file, line: entry.line, field: entry.key, relatedLines: [first.line] },
        `"${quoteForMessage(entry.key)}" is "${quoteForMessage(entry.value)}" here but "${quoteForMessage(first.value)}" on line ${first.line}`,
        `each "# ${quoteForMessage(entry.key)}:" line to give the same value`,
      );
    }
  }

  const result: FileMetadata = { metadata: { extra: {} } };
  const extra: [string, string][] = [];
  for (const entry of seen.values()) {
    switch (entry.key) {
      case 'serial':
        result.serial = { value: entry.value, line: entry.line };
        break;
      case 'channel':
        result.channel = { value: readChannel(entry, context.file), line: entry.line };
        break;
      case 'sweep':
        result.sweepKind = readSweepKind(entry, context.file);
        break;
      case 'temperature_c':
        result.metadata.temperatureC = readTemperature(entry, context);
        break;
      case 'lot':
        result.metadata.lot = entry.value;
        break;
      case 'device_type':
        result.metadata.deviceType = entry.value;
        break;
      case 'station':
        result.metadata.station = entry.value;
        break;
      case 'operator':
        result.metadata.operator = entry.value;
        break;
      default:
        extra.push([entry.key, entry.value]);
    }
  }
  result.metadata.extra = Object.fromEntries(extra);
  return result;
}

function readChannel(entry: MetadataEntry, file: string): Channel {
  let letters = '';
  for (const c of entry.value.toLowerCase()) if (c >= 'a' && c <= 'z') letters += c;
  if (letters === 'n' || letters === 'nchannel' || letters === 'njf') return 'n';
  if (letters === 'p' || letters === 'pchannel' || letters === 'pjf') return 'p';
  throw new SweepFileError(
    'bad_metadata',
    { file, line: entry.line, field: 'channel' },
    `unknown channel "${quoteForMessage(entry.value)}"`,
    '"n" or "p" (also "n-channel", "p-channel", "NJF", "PJF")',
  );
}

function readSweepKind(entry: MetadataEntry, file: string): SweepKind {
  const value = entry.value.trim().toLowerCase();
  if (value === 'output' || value === 'output family' || value === 'output characteristic') return 'output';
  if (value === 'transfer' || value === 'transfer characteristic') return 'transfer';
  throw new SweepFileError(
    'bad_metadata',
    { file, line: entry.line, field: 'sweep' },
    `unknown sweep kind "${quoteForMessage(entry.value)}"`,
    '"output" (ID against VDS at fixed gate steps) or "transfer" (ID against VGS at fixed VDS)',
  );
}

function readTemperature(entry: MetadataEntry, context: { file: string; decimalComma: boolean }): number {
  let text = entry.value.trim();
  const lower = text.toLowerCase();
  if (lower.endsWith('°c')) text = text.slice(0, -2);
  else if (lower.endsWith('c')) text = text.slice(0, -1);
  const value = readNumberCell(text, context.decimalComma);
  if (typeof value === 'number' && value >= MIN_TEMPERATURE_C && value <= MAX_TEMPERATURE_C) return value;
  const where = { file: context.file, line: entry.line, field: 'temperature_c' };
  if (typeof value === 'number' || value === 'not_finite') {
    throw new SweepFileError(
      'bad_metadata',
      where,
      `the temperature "${quoteForMessage(entry.value)}" is outside ${MIN_TEMPERATURE_C} to ${MAX_TEMPERATURE_C} °C`,
      `a measurement temperature between ${MIN_TEMPERATURE_C} and ${MAX_TEMPERATURE_C} °C, as for the upload's temperature field, e.g. "# temperature_c: 25"`,
    );
  }
  throw new SweepFileError(
    'bad_metadata',
    where,
    `the temperature "${quoteForMessage(entry.value)}" is not a temperature in °C`,
    'a number of degrees Celsius, e.g. "# temperature_c: 25"',
  );
}

import { SweepFileError } from './errors';

/** Leading bytes of formats people upload by mistake, with the name used in the refusal. */
const SIGNATURES: { bytes: number[]; what: string }[] = [
  { bytes: [0x1f, 0x8b], what: 'a gzip file' },
  { bytes: [0x50, 0x4b, 0x03, 0x04], what: 'a zip file (an .xlsx workbook is one)' },
  { bytes: [0x50, 0x4b, 0x05, 0x06], what: 'a zip file (an .xlsx workbook is one)' },
  { bytes: [0x50, 0x4b, 0x07, 0x08], what: 'a zip file (an .xlsx workbook is one)' },
  { bytes: [0x25, 0x50, 0x44, 0x46, 0x2d], what: 'a PDF document' },
  { bytes: [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a], what: 'a PNG image' },
  { bytes: [0xff, 0xd8, 0xff], what: 'a JPEG image' },
  { bytes: [0x47, 0x49, 0x46, 0x38], what: 'a GIF image' },
  { bytes: [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1], what: 'an old Microsoft Office file (an .xls workbook is one)' },
  { bytes: [0x42, 0x5a, 0x68], what: 'a bzip2 file' },
  { bytes: [0xfd, 0x37, 0x7a, 0x58, 0x5a, 0x00], what: 'an xz file' },
  { bytes: [0x37, 0x7a, 0xbc, 0xaf, 0x27, 0x1c], what: 'a 7-Zip file' },
  { bytes: [0x28, 0xb5, 0x2f, 0xfd], what: 'a zstd file' },
  { bytes: [0x7f, 0x45, 0x4c, 0x46], what: 'a program (ELF executable)' },
  { bytes: [0x00, 0x00, 0xfe, 0xff], what: 'UTF-32 text' },
  { bytes: [0xff, 0xfe, 0x00, 0x00], what: 'UTF-32 text' },
  { bytes: [0xff, 0xfe], what: 'UTF-16 text' },
  { bytes: [0xfe, 0xff], what: 'UTF-16 text' },
];
const TEXT_ENCODINGS = new Set(['UTF-32 text', 'UTF-16 text']);

const SAVE_AS_TEXT = 'a plain-text CSV or TSV file in UTF-8; export the sweep as text (e.g. "CSV UTF-8") from the instrument or spreadsheet';

/**
 * Why these bytes are not a text file, or null when they may be one: a known binary or
 * compressed format by its leading bytes, UTF-16 or UTF-32 (by byte-order mark, or by zero
 * bytes at every other position), a NUL byte anywhere, or another control byte (anything
 * below 0x20 except tab, line feed and carriage return, and DEL; one trailing Ctrl-Z, the old
 * DOS end-of-file mark, is allowed). Cheap: the native `indexOf` finds a NUL, then one pass.
 */
export function describeNonText(bytes: Uint8Array): { what: string; offset?: number } | null {
  for (const s of SIGNATURES) {
    if (bytes.length >= s.bytes.length && s.bytes.every((b, i) => bytes[i] === b)) {
      return { what: TEXT_ENCODINGS.has(s.what) ? `${s.what} (by its byte-order mark), not UTF-8` : `${s.what}, not text` };
    }
  }
  const nul = bytes.indexOf(0);
  if (nul >= 0) {
    if (looksLikeUtf16WithoutBom(bytes)) return { what: 'UTF-16 text without a byte-order mark (every other byte is zero), not UTF-8' };
    return { what: 'binary data, not text: it contains a NUL byte', offset: nul };
  }
  const last = bytes.length - 1;
  for (let i = 0; i < bytes.length; i++) {
    const b = bytes[i];
    if (b >= 0x20 && b !== 0x7f) continue;
    if (b === 0x09 || b === 0x0a || b === 0x0d) continue;
    if (b === 0x1a && i === last) continue;
    return { what: `binary data, not text: it contains the control byte 0x${b.toString(16).padStart(2, '0')}`, offset: i };
  }
  return null;
}

function looksLikeUtf16WithoutBom(bytes: Uint8Array): boolean {
  const n = Math.min(bytes.length, 4096) & ~1;
  if (n < 4) return false;
  let evenZero = 0;
  let oddZero = 0;
  for (let i = 0; i < n; i += 2) {
    if (bytes[i] === 0) evenZero++;
    if (bytes[i + 1] === 0) oddZero++;
  }
  const pairs = n / 2;
  return (evenZero > 0.4 * pairs && oddZero < 0.05 * pairs) || (oddZero > 0.4 * pairs && evenZero < 0.05 * pairs);
}

/**
 * Decodes an uploaded sweep file, refusing at once (`not_text`, see `describeNonText`)
 * anything that is not text. UTF-8 is expected (a leading byte-order mark is dropped); bytes
 * that are not valid UTF-8 are read as Windows-1252, the code page older instrument software
 * writes "µA" and "°C" in.
 */
export function decodeSweepBytes(bytes: Uint8Array, fileName: string): string {
  const refusal = nonTextError(bytes, fileName);
  if (refusal) throw refusal;
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true, ignoreBOM: false }).decode(bytes);
  } catch {
    text = new TextDecoder('windows-1252').decode(bytes);
  }
  if (text.length > 0 && text.charCodeAt(text.length - 1) === 0x1a) text = text.slice(0, -1);
  return text;
}

/** The `not_text` refusal of these bytes (see `describeNonText`), or null when they may be text. */
export function nonTextError(bytes: Uint8Array, fileName: string): SweepFileError | null {
  const problem = describeNonText(bytes);
  if (!problem) return null;
  const where = problem.offset !== undefined ? ` (byte ${problem.offset + 1}, line ${lineOfOffset(bytes, problem.offset)})` : '';
  return new SweepFileError(
    'not_text',
    { file: fileName.trim() === '' ? '(unnamed file)' : fileName },
    `this looks like ${problem.what}${where}`,
    SAVE_AS_TEXT,
  );
}

function lineOfOffset(bytes: Uint8Array, offset: number): number {
  let line = 1;
  for (let i = 0; i < offset; i++) {
    if (bytes[i] === 0x0a || (bytes[i] === 0x0d && bytes[i + 1] !== 0x0a)) line++;
  }
  return line;
}

import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { decodeSweepBytes, MAX_MESSAGE_LENGTH, parseSweepFile, SweepFileError } from '~/core/sweep-file';

/**
 * The refusal corpus: every file in tests/fixtures/malformed/ against the table in
 * expected.json, read as the intake reads it (bytes → decodeSweepBytes → parseSweepFile).
 * Source of the codes: the list of refusals and of hostile files (binary, compressed,
 * UTF-16, NUL, implausible values, bad serials; make-hostile.mjs writes those). Each file was
 * built with one defect at a known row; its message was read against the file before it went
 * into the table.
 */
const folder = fileURLToPath(new URL('../fixtures/malformed/', import.meta.url));
const expected = JSON.parse(readFileSync(folder + 'expected.json', 'utf8')) as Record<
  string,
  { code: string; line: number | null; column: number | null; message: string; byteLength?: number }
>;

function refusal(fileName: string, byteLength?: number): SweepFileError {
  const bytes = readFileSync(folder + fileName);
  try {
    parseSweepFile({ text: decodeSweepBytes(bytes, fileName), fileName, byteLength: byteLength ?? bytes.length });
  } catch (error) {
    if (error instanceof SweepFileError) return error;
    throw error;
  }
  throw new Error(`${fileName} was accepted`);
}

describe('malformed sweep files', () => {
  it('has a table entry for every file and a file for every entry', () => {
    const files = readdirSync(folder).filter((f) => !/\.(json|md|mjs)$/.test(f)).sort();
    expect(Object.keys(expected).sort()).toEqual(files);
    // The issue asks for at least 60 hostile and messy files.
    expect(files.length).toBeGreaterThanOrEqual(60);
  });

  it('covers every error code the issue names', () => {
    const codes = new Set(Object.values(expected).map((e) => e.code));
    // The list in the issue (too_large, empty_file, … unknown_unit), plus our own additions.
    for (const code of [
      'empty_file', 'no_header', 'missing_column', 'non_numeric', 'not_finite', 'too_few_points',
      'too_few_curves', 'mixed_signs', 'duplicate_point', 'too_large', 'ragged_row', 'unknown_unit',
      'not_text', 'implausible_value', 'bad_serial', 'bad_metadata', 'bad_header',
    ]) {
      expect(codes).toContain(code);
    }
  });

  describe.each(Object.entries(expected))('%s', (fileName, want) => {
    it(`is refused with ${want.code} and its exact message`, () => {
      const error = refusal(fileName, want.byteLength);
      expect({ code: error.code, line: error.line ?? null, column: error.column ?? null, message: error.message }).toEqual({
        code: want.code,
        line: want.line,
        column: want.column,
        message: want.message,
      });
      expect(error.file).toBe(fileName);
      expect(error.message.startsWith(fileName)).toBe(true);
      expect(error.message).toContain('Expected ');
      // Never a control or invisible formatting character raw, and never longer than the cap.
      // eslint-disable-next-line no-control-regex
      expect(error.message).not.toMatch(/[\u0000-\u001f\u007f-\u009f\u200b-\u200f\u2028-\u202e\u2060-\u2069]/);
      expect(error.message.length).toBeLessThanOrEqual(MAX_MESSAGE_LENGTH);
      if (want.line !== null && want.code !== 'not_text') {
        const lines = readFileSync(folder + fileName, 'utf8').split(/\r\n|\r|\n/);
        expect(lines[want.line - 1]?.trim()).not.toBe('');
      }
    });
  });

  it('cites the cell of a duplicate point by both lines', () => {
    // duplicate-point.csv: the VDS = 1 V row of the VGS = -0.5 V curve (line 11) was
    // overwritten with the VDS = 3 V row (line 13), so lines 11 and 13 carry the same point.
    const error = refusal('duplicate-point.csv');
    expect(error.line).toBe(13);
    expect(error.relatedLines).toEqual([11]);
    const lines = readFileSync(folder + 'duplicate-point.csv', 'utf8').split('\n');
    expect(lines[10]).toBe(lines[12]);
  });
});

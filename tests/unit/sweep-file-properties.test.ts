import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { intrinsicDrainCurrentA } from '~/core/jfet-model';
import {
  decodeSweepBytes,
  MIN_CURVES_PER_PART,
  MIN_POINTS_PER_CURVE,
  MIN_POINTS_PER_TRANSFER_CURVE,
  parseSweepFile,
  SweepFileError,
  type ParsedSweepFile,
} from '~/core/sweep-file';

/** Parses, and returns the result or the SweepFileError; anything else thrown escapes. */
function parseOrRefuse(text: string, fileName = 'JX-1.csv'): ParsedSweepFile | SweepFileError {
  try {
    return parseSweepFile({ text, fileName, byteLength: text.length });
  } catch (error) {
    if (error instanceof SweepFileError) return error;
    throw error;
  }
}

/** The output contract: finite numbers, minimum sizes, sorted curves and points. */
function expectWellFormed(result: ParsedSweepFile | SweepFileError) {
  if (result instanceof SweepFileError) {
    expect(result.message.length).toBeGreaterThan(0);
    return;
  }
  for (const part of result.parts) {
    // Output families: short curves are kept beside at least two full ones (FORMATS.md).
    if (part.kind === 'output') {
      expect(part.curves.length).toBeGreaterThanOrEqual(MIN_CURVES_PER_PART);
      expect(part.curves.filter((c) => c.points.vdsV.length >= MIN_POINTS_PER_CURVE).length).toBeGreaterThanOrEqual(2);
      expect(part.transferCurves).toEqual([]);
    } else {
      expect(part.transferCurves.some((t) => t.points.vgsV.length >= MIN_POINTS_PER_TRANSFER_CURVE)).toBe(true);
    }
    let previousVgs = -Infinity;
    for (const curve of part.curves) {
      expect(Number.isFinite(curve.vgsV)).toBe(true);
      expect(curve.vgsV).toBeGreaterThan(previousVgs);
      previousVgs = curve.vgsV;
      const { vdsV, idA, sourceLine } = curve.points;
      expect(vdsV.length).toBeGreaterThanOrEqual(1);
      expect(idA.length).toBe(vdsV.length);
      expect(sourceLine.length).toBe(vdsV.length);
      for (let k = 0; k < vdsV.length; k++) {
        expect(Number.isFinite(vdsV[k]) && Number.isFinite(idA[k])).toBe(true);
        if (k > 0) expect(vdsV[k]).toBeGreaterThan(vdsV[k - 1]);
      }
    }
    if (part.metadata.temperatureC !== undefined) expect(Number.isFinite(part.metadata.temperatureC)).toBe(true);
  }
}

const sweeps = fileURLToPath(new URL('../fixtures/sweeps/', import.meta.url));
const validTexts = readdirSync(sweeps)
  .filter((f) => /\.(csv|tsv)$/.test(f))
  .sort()
  .map((f) => readFileSync(sweeps + f, 'utf8'));

const PIECES = [
  'vgs', 'vds', 'id', ' (mA)', '_uA', '[V]', '@vgs=-0.5', 'serial', '# serial: X', '# channel: p',
  '# temperature_c: ', ',', ';', '\t', '\n', '\r\n', '\r', '"', '-', '.', ',5', '0', '1', '9', 'e',
  'E-3', 'NaN', 'inf', '-0', ' ', '\uFEFF', '#', ':', 'µ', '1e400', '\u0000',
];

describe('the parser throws nothing but SweepFileError (fast-check)', () => {
  // Source: the contract: arbitrary input never escapes as another error and never
  // yields NaN or Infinity.
  it('on arbitrary strings', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 400 }), (text) => expectWellFormed(parseOrRefuse(text))),
      { numRuns: 400 },
    );
  });

  it('on strings made of sweep-file pieces', () => {
    fc.assert(
      fc.property(fc.array(fc.constantFrom(...PIECES), { maxLength: 120 }), (pieces) =>
        expectWellFormed(parseOrRefuse(pieces.join(''))),
      ),
      { numRuns: 400 },
    );
  });

  const mutation = fc.oneof(
    fc.record({ kind: fc.constant('insert' as const), at: fc.nat(), piece: fc.constantFrom(...PIECES) }),
    fc.record({ kind: fc.constant('delete' as const), at: fc.nat(), length: fc.integer({ min: 1, max: 12 }) }),
    fc.record({ kind: fc.constant('replace' as const), at: fc.nat(), piece: fc.constantFrom(...PIECES) }),
    fc.record({ kind: fc.constant('dropLine' as const), at: fc.nat() }),
    fc.record({ kind: fc.constant('repeatLine' as const), at: fc.nat() }),
    fc.record({ kind: fc.constant('swapLines' as const), at: fc.nat(), other: fc.nat() }),
  );

  it('on valid files with random edits', () => {
    fc.assert(
      fc.property(fc.nat({ max: validTexts.length - 1 }), fc.array(mutation, { minLength: 1, maxLength: 6 }), (which, edits) => {
        let text = validTexts[which];
        for (const edit of edits) {
          const at = edit.at % (text.length + 1);
          if (edit.kind === 'insert') text = text.slice(0, at) + edit.piece + text.slice(at);
          else if (edit.kind === 'delete') text = text.slice(0, at) + text.slice(at + edit.length);
          else if (edit.kind === 'replace') text = text.slice(0, at) + edit.piece + text.slice(at + edit.piece.length);
          else {
            const lines = text.split('\n');
            const i = edit.at % lines.length;
            if (edit.kind === 'dropLine') lines.splice(i, 1);
            else if (edit.kind === 'repeatLine') lines.splice(i, 0, lines[i]);
            else {
              const j = edit.other % lines.length;
              [lines[i], lines[j]] = [lines[j], lines[i]];
            }
            text = lines.join('\n');
          }
        }
        expectWellFormed(parseOrRefuse(text));
      }),
      { numRuns: 600 },
    );
  });
});

describe('writing a family and reading it back (fast-check)', () => {
  // Oracle: ECMAScript Number() on "<cell as written>e<unit power>" is the double nearest
  // the decimal value (IEEE 754 round-to-nearest), so the parser must return exactly that;
  // the N-equivalent signs follow jfet-model.ts (P: VGS, VDS, ID all negated).
  const layout = fc.record({
    vtoV: fc.double({ min: -4, max: -0.5, noNaN: true }),
    betaAPerV2: fc.double({ min: 1e-4, max: 5e-3, noNaN: true }),
    lambdaPerV: fc.double({ min: 0, max: 0.05, noNaN: true }),
    channel: fc.constantFrom('n' as const, 'p' as const),
    magnitudes: fc.boolean(),
    wide: fc.boolean(),
    delimiter: fc.constantFrom(',', ';', '\t'),
    eol: fc.constantFrom('\n', '\r\n'),
    bom: fc.boolean(),
    idUnit: fc.constantFrom(['A', 0], ['mA', -3], ['uA', -6], ['nA', -9]),
    vgsInMv: fc.boolean(),
    steps: fc.integer({ min: 3, max: 6 }),
    points: fc.integer({ min: 8, max: 14 }),
  });

  it('returns every written value, N-equivalent, sorted', () => {
    fc.assert(
      fc.property(layout, (l) => {
        const card = { vtoV: l.vtoV, betaAPerV2: l.betaAPerV2, lambdaPerV: l.lambdaPerV };
        const sign = l.channel === 'p' ? -1 : 1;
        const vdsSign = l.channel === 'p' && !l.magnitudes ? -1 : 1;
        const decimal = (s: string) => (l.delimiter === ',' ? s : s.replace('.', ','));
        const [unit, power] = l.idUnit as [string, number];
        const vgsSteps = Array.from({ length: l.steps }, (_, k) => -0.25 * k);
        const vdsValues = Array.from({ length: l.points }, (_, k) => 0.75 * k);
        const idCell = (vgs: number, vds: number) =>
          (vdsSign * intrinsicDrainCurrentA(card, vgs, vds) * 10 ** -power).toPrecision(10);
        const vgsCell = (vgs: number) => String(l.vgsInMv ? sign * -vgs * -1000 : sign * vgs);
        const vgsHeader = l.vgsInMv ? 'VGS (mV)' : 'VGS (V)';
        const lines = [`# channel: ${l.channel}`];
        const expected = new Map<string, string>();
        if (l.wide) {
          lines.push(['VDS (V)', ...vgsSteps.map((v) => `ID (${unit}) @ VGS=${decimal(vgsCell(v))}${l.vgsInMv ? ' mV' : ''}`)].join(l.delimiter));
          for (const vds of vdsValues) {
            const cells = vgsSteps.map((vgs) => idCell(vgs, vds));
            vgsSteps.forEach((vgs, k) => expected.set(`${vgs}|${vds}`, cells[k]));
            lines.push([String(vdsSign * vds), ...cells].map(decimal).join(l.delimiter));
          }
        } else {
          lines.push([`ID (${unit})`, 'VDS (V)', vgsHeader].join(l.delimiter));
          for (const vgs of [...vgsSteps].reverse()) {
            for (const vds of vdsValues) {
              const cell = idCell(vgs, vds);
              expected.set(`${vgs}|${vds}`, cell);
              lines.push([cell, String(vdsSign * vds), vgsCell(vgs)].map(decimal).join(l.delimiter));
            }
          }
        }
        const text = (l.bom ? '\uFEFF' : '') + lines.join(l.eol) + l.eol;
        const parsed = parseSweepFile({ text, fileName: 'JX-2.csv', byteLength: text.length });
        expect(parsed.channel).toBe(l.channel);
        expect(parsed.format).toBe(l.wide ? 'wide' : 'long');
        const [part] = parsed.parts;
        expect(part.curves.map((c) => c.vgsV)).toEqual([...vgsSteps].reverse().map((v) => (v === 0 ? 0 : v)));
        for (const curve of part.curves) {
          expect(curve.points.vdsV).toEqual(vdsValues);
          curve.points.idA.forEach((id, k) => {
            const written = expected.get(`${curve.vgsV === 0 ? 0 : curve.vgsV}|${vdsValues[k]}`)!;
            const [mantissa, exponent = '0'] = written.split('e');
            const want = vdsSign * Number(`${mantissa}e${Number(exponent) + power}`);
            expect(id).toBe(want === 0 ? 0 : want);
          });
        }
      }),
      { numRuns: 300 },
    );
  });
});

describe('bytes as uploaded: decodeSweepBytes then parseSweepFile (fast-check)', () => {
  // Source: the hostile-file contract: binary data, UTF-16 and NUL bytes anywhere give
  // the parser's own error (code not_text for NUL), never another exception, and no message
  // carries a control character raw.
  const validBytes = validTexts.map((t) => new TextEncoder().encode(t));

  function readOrRefuse(bytes: Uint8Array, fileName = 'JX-3.csv'): ParsedSweepFile | SweepFileError {
    try {
      return parseSweepFile({ text: decodeSweepBytes(bytes, fileName), fileName, byteLength: bytes.length });
    } catch (error) {
      if (error instanceof SweepFileError) return error;
      throw error;
    }
  }

  function expectSafe(result: ParsedSweepFile | SweepFileError) {
    expectWellFormed(result);
    // eslint-disable-next-line no-control-regex
    if (result instanceof SweepFileError) expect(result.message).not.toMatch(/[\u0000-\u001f\u007f]/);
  }

  it('on random bytes', () => {
    fc.assert(fc.property(fc.uint8Array({ maxLength: 600 }), (bytes) => expectSafe(readOrRefuse(bytes))), { numRuns: 500 });
  });

  it('on random text written as UTF-16 (either byte order, with or without a byte-order mark)', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', minLength: 1, maxLength: 300 }), fc.boolean(), fc.boolean(), (text, bigEndian, bom) => {
        const body = Buffer.from((bom ? '\uFEFF' : '') + text, 'utf16le');
        const result = readOrRefuse(new Uint8Array(bigEndian ? body.swap16() : body));
        expectSafe(result);
      }),
      { numRuns: 400 },
    );
  });

  it('refuses every valid file as UTF-16 with not_text', () => {
    for (const text of validTexts) {
      for (const bytes of [Buffer.from(text, 'utf16le'), Buffer.from(text, 'utf16le').swap16()]) {
        const result = readOrRefuse(new Uint8Array(bytes));
        expect(result).toBeInstanceOf(SweepFileError);
        expect((result as SweepFileError).code).toBe('not_text');
      }
    }
  });

  it('refuses a NUL byte anywhere in a valid file with not_text', () => {
    fc.assert(
      fc.property(fc.nat({ max: validBytes.length - 1 }), fc.array(fc.nat(), { minLength: 1, maxLength: 4 }), (which, places) => {
        const source = validBytes[which];
        const bytes = new Uint8Array(source.length + places.length);
        bytes.set(source);
        for (const place of places) {
          const at = place % (source.length + 1);
          bytes.copyWithin(at + 1, at, bytes.length - 1);
          bytes[at] = 0;
        }
        const result = readOrRefuse(bytes);
        expect(result).toBeInstanceOf(SweepFileError);
        expect((result as SweepFileError).code).toBe('not_text');
      }),
      { numRuns: 300 },
    );
  });
});

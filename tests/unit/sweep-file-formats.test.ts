import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { intrinsicDrainCurrentA, type JfetParams } from '~/core/jfet-model';
import {
  MAX_SWEEP_POINTS_PER_FILE,
  parseSweepFile,
  SweepFileError,
  type ParsedSweepFile,
  type ParseSweepFileInput,
} from '~/core/sweep-file';
import { readNumberCell } from '~/core/sweep-file/read-number-cell';

const sweeps = fileURLToPath(new URL('../fixtures/sweeps/', import.meta.url));

function parseFixture(fileName: string): ParsedSweepFile {
  const bytes = readFileSync(sweeps + fileName);
  return parseSweepFile({ text: bytes.toString('utf8'), fileName, byteLength: bytes.length });
}

function fixtureLines(fileName: string): string[] {
  return readFileSync(sweeps + fileName, 'utf8').split(/\r\n|\n/);
}

function parseText(text: string, options: Partial<ParseSweepFileInput> = {}): ParsedSweepFile {
  return parseSweepFile({ text, fileName: 'JX-1.csv', byteLength: text.length, ...options });
}

function refusalOf(text: string, options: Partial<ParseSweepFileInput> = {}): SweepFileError {
  try {
    parseText(text, options);
  } catch (error) {
    if (error instanceof SweepFileError) return error;
    throw error;
  }
  throw new Error('the file was accepted');
}

/** Parameters of the ngspice cards that made tests/fixtures/sweeps (see its README.md). */
const NGSPICE_CARDS: Record<string, Pick<JfetParams, 'vtoV' | 'betaAPerV2' | 'lambdaPerV'>> = {
  'JX-0101': { vtoV: -2.0, betaAPerV2: 1.25e-3, lambdaPerV: 0.02 },
  'JX-0102': { vtoV: -1.6, betaAPerV2: 1.6e-3, lambdaPerV: 0.015 },
  'JX-0103': { vtoV: -2.4, betaAPerV2: 1.0e-3, lambdaPerV: 0.025 },
  'JX-0104': { vtoV: -1.8, betaAPerV2: 1.4e-3, lambdaPerV: 0.018 },
  'JX-0105': { vtoV: -1.2, betaAPerV2: 2.5e-3, lambdaPerV: 0.03 },
  'JP-0201': { vtoV: -2.0, betaAPerV2: 1.25e-3, lambdaPerV: 0.02 },
};

/** Invented part for the inline files below (level-1 equations of jfet-model.ts). */
const CARD = { vtoV: -2, betaAPerV2: 1.25e-3, lambdaPerV: 0.02 };
const STEPS_V = [-1.5, -1, -0.5, 0];
const VDS_V = [0, 0.5, 1, 1.5, 2, 3, 4, 6, 8, 10];

/** Rows of the invented part, each cell written by `cells(vgsV, vdsV, idA)`. */
function rowsOf(cells: (vgsV: number, vdsV: number, idA: number) => string[], delimiter = ','): string[] {
  const rows: string[] = [];
  for (const vgs of STEPS_V) for (const vds of VDS_V) rows.push(cells(vgs, vds, intrinsicDrainCurrentA(CARD, vgs, vds)).join(delimiter));
  return rows;
}

function expectCardFamily(parsed: ParsedSweepFile, relTol = 1e-9) {
  const part = parsed.parts[0];
  expect(part.curves.map((c) => c.vgsV)).toEqual(STEPS_V);
  for (const curve of part.curves) {
    expect(curve.points.vdsV).toEqual(VDS_V);
    curve.points.idA.forEach((id, k) => {
      const want = intrinsicDrainCurrentA(CARD, curve.vgsV, VDS_V[k]);
      expect(Math.abs(id - want)).toBeLessThanOrEqual(relTol * Math.abs(want));
    });
  }
}

describe('example files simulated with ngspice', () => {
  // Source: ngspice DC sweeps of the NJF/PJF cards in tests/fixtures/sweeps/README.md,
  // written to 6 significant digits. The parser's unit scaling and sign handling must give
  // back the level-1 currents of those cards (ngspice manual, JFET level 1) within that
  // rounding plus ngspice's GMIN leakage (1e-12 S across each junction).
  const files = ['long-one-part.csv', 'long-two-parts.csv', 'wide-one-part.csv', 'p-channel-datasheet.tsv', 'semicolon-decimal-comma.csv'];
  it.each(files)('%s reproduces the ngspice card of each part', (fileName) => {
    const parsed = parseFixture(fileName);
    for (const part of parsed.parts) {
      const card = NGSPICE_CARDS[part.serial];
      expect(card).toBeDefined();
      expect(part.curves.length).toBe(4);
      for (const curve of part.curves) {
        expect(curve.points.vdsV.length).toBe(11);
        curve.points.vdsV.forEach((vds, k) => {
          const want = intrinsicDrainCurrentA(card, curve.vgsV, vds);
          const got = curve.points.idA[k];
          expect(Math.abs(got - want)).toBeLessThanOrEqual(5e-6 * Math.abs(want) + 1e-10);
        });
      }
    }
  });

  it('long CSV, one part: serial and metadata from comment lines, lines kept per point', () => {
    const parsed = parseFixture('long-one-part.csv');
    const lines = fixtureLines('long-one-part.csv');
    expect(parsed.format).toBe('long');
    expect(parsed.headerLine).toBe(lines.indexOf('vgs (V),vds (V),id (mA)') + 1);
    expect(parsed.signConvention).toBe('n-equivalent');
    expect(parsed.channel).toBeUndefined();
    const [part] = parsed.parts;
    expect(part.serial).toBe('JX-0101');
    expect(part.serialSource).toBe('comment');
    expect(part.metadata).toEqual({
      lot: 'L-2031',
      deviceType: 'J-demo-N',
      temperatureC: 25,
      station: 'bench-2',
      operator: 'rk',
      extra: { fixture: 'socket B' },
    });
    const curve = part.curves.find((c) => c.vgsV === -0.5)!;
    const row = lines.indexOf('-0.5,3,2.98125') + 1;
    expect(row).toBeGreaterThan(0);
    expect(curve.points.sourceLine[curve.points.vdsV.indexOf(3)]).toBe(row);
    expect(curve.firstLine).toBe(lines.findIndex((l) => l.startsWith('-0.5,0,')) + 1);
  });

  it('long CSV with a serial column: two parts, channel declared in the file', () => {
    const parsed = parseFixture('long-two-parts.csv');
    expect(parsed.parts.map((p) => p.serial)).toEqual(['JX-0102', 'JX-0103']);
    expect(parsed.parts.every((p) => p.serialSource === 'column' && p.channel === 'n')).toBe(true);
    expect(parsed.channelSource).toBe('file');
    expect(parsed.signConvention).toBe('datasheet');
    expect(parsed.parts[1].metadata.deviceType).toBe('J-demo-N');
  });

  it('wide CSV: one gate step per column, "-0" read as 0', () => {
    const parsed = parseFixture('wide-one-part.csv');
    expect(parsed.format).toBe('wide');
    const curves = parsed.parts[0].curves;
    expect(curves.map((c) => c.sourceColumn)).toEqual([2, 3, 4, 5]);
    // The file writes ngspice's -0 A for VGS = 0 V at VDS = 0; IEEE 754 -0 must not leak out.
    expect(fixtureLines('wide-one-part.csv').some((l) => l.endsWith(',-0'))).toBe(true);
    expect(Object.is(curves[3].points.idA[0], 0)).toBe(true);
  });

  it('P-channel file in datasheet signs equals its N-channel twin once N-equivalent', () => {
    // Source: the ngspice manual's PJF convention (the NJF equations on -VGS, -VDS, -ID):
    // JP-0201 (PJF) and JX-0101 (NJF) share one card, so ngspice gives mirrored data.
    const p = parseFixture('p-channel-datasheet.tsv');
    const n = parseFixture('long-one-part.csv');
    expect(p.delimiter).toBe('\t');
    expect(p.channel).toBe('p');
    expect(p.channelSource).toBe('signs');
    expect(p.signConvention).toBe('datasheet');
    expect(p.parts[0].curves.map((c) => [c.vgsV, c.points.vdsV, c.points.idA])).toEqual(
      n.parts[0].curves.map((c) => [c.vgsV, c.points.vdsV, c.points.idA]),
    );
  });

  it('semicolons, decimal commas, BOM and CRLF, VGS in mV and ID in µA', () => {
    const bytes = readFileSync(sweeps + 'semicolon-decimal-comma.csv');
    // Source: Unicode's UTF-8 byte-order mark is EF BB BF; RFC 4180 line ends are CRLF.
    expect([...bytes.subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    expect(bytes.includes('\r\n')).toBe(true);
    const parsed = parseFixture('semicolon-decimal-comma.csv');
    expect(parsed.delimiter).toBe(';');
    expect(parsed.decimalSeparator).toBe(',');
    expect(parsed.headerLine).toBe(4);
    expect(parsed.parts[0].curves.map((c) => c.vgsV)).toEqual([-0.9, -0.6, -0.3, 0]);
    expect(parsed.parts[0].metadata.temperatureC).toBe(23.5);
  });
});

describe('numbers in cells', () => {
  // Source: ISO 80000-1 allows a comma or a point as decimal sign; the value of a decimal
  // string is the double nearest to it (IEEE 754 / ECMAScript Number), hence exact equality.
  it.each([
    ['-0.5', false, 0, -0.5],
    ['-0,5', true, 0, -0.5],
    [' +.5 ', false, 0, 0.5],
    ['5.', false, 0, 5],
    ['1.25e-3', false, 0, 0.00125],
    ['2.5', false, -3, 0.0025],
    ['3.825', false, -3, 0.003825],
    ['1,51E-09', true, -3, 1.51e-12],
    ['-0', false, 0, 0],
  ] as const)('%j (decimal comma %s, ×10^%i) is %d', (cell, decimalComma, power, want) => {
    const got = readNumberCell(cell, decimalComma, power);
    expect(Object.is(got, want)).toBe(true);
  });

  it.each([
    ['', 'empty'],
    ['1,5', 'non_numeric'],
    ['1.2.3', 'non_numeric'],
    ['0x10', 'non_numeric'],
    ['1e', 'non_numeric'],
    ['12 mA', 'non_numeric'],
    ['1 000', 'non_numeric'],
    ['NaN', 'not_finite'],
    ['-Infinity', 'not_finite'],
    ['inf', 'not_finite'],
    ['1e400', 'not_finite'],
  ])('%j is refused as %s', (cell, problem) => {
    expect(readNumberCell(cell, false)).toBe(problem);
  });
});

describe('header names and units', () => {
  // Source: SI Brochure (BIPM, 9th ed.), prefixes m = 1e-3, µ = 1e-6, n = 1e-9.
  it.each([
    ['vgs (V),vds (V),id (mA)', 1, 1, 1e-3],
    ['VGS_mV,VDS_V,ID_uA', 1e-3, 1, 1e-6],
    ['Vgs [V],Vds [mV],Id [µA]', 1, 1e-3, 1e-6],
    ['vgs/V,vds/V,id/nA', 1, 1, 1e-9],
    ['vgs mV,vds V,id μA', 1e-3, 1, 1e-6],
    ['VGS,VDS,ID', 1, 1, 1],
    ['id (mA),time (s),vds (V),ig (nA),vgs (V)', 1, 1, 1e-3],
  ])('%s', (header, vgsUnit, vdsUnit, idUnit) => {
    const names = header.split(',').map((h) => h.split(/[ _/([]/)[0].toLowerCase());
    const rows = rowsOf((vgs, vds, id) =>
      names.map((n) => (n === 'vgs' ? vgs / vgsUnit : n === 'vds' ? vds / vdsUnit : n === 'id' ? id / idUnit : 7).toPrecision(12)),
    );
    expectCardFamily(parseText([header, ...rows].join('\n')));
  });

  it.each(['id (kA)', 'id (mV)', 'id (ma'])('refuses the unit of %s', (idHeader) => {
    const error = refusalOf(`vgs,vds,${idHeader}\n`);
    expect(error.code).toBe('unknown_unit');
    expect(error.column).toBe(3);
  });

  // Source: the wide-format spellings listed in src/core/sweep-file/FORMATS.md.
  it.each([
    [',', (v: number) => `id_mA@vgs=${v}`, 1e-3],
    [',', (v: number) => `ID (mA) @ VGS=${v} V`, 1e-3],
    [',', (v: number) => `Id [uA] @ VGS = ${v * 1000} mV`, 1e-6],
    [',', (v: number) => `id@vgs=${v}`, 1],
    [';', (v: number) => `"id (mA) @ vgs=${String(v).replace('.', ',')}"`, 1e-3],
  ])('wide header %#', (delimiter, stepHeader, idUnit) => {
    const header = ['vds (V)', ...STEPS_V.map(stepHeader)].join(delimiter);
    const rows = VDS_V.map((vds) =>
      [vds, ...STEPS_V.map((vgs) => intrinsicDrainCurrentA(CARD, vgs, vds) / idUnit)]
        .map((x) => (delimiter === ';' ? x.toPrecision(12).replace('.', ',') : x.toPrecision(12)))
        .join(delimiter),
    );
    const parsed = parseText([header, ...rows].join('\n'));
    expect(parsed.format).toBe('wide');
    expectCardFamily(parsed);
  });

  it('wide format: an empty ID cell means no point at that VDS', () => {
    const header = ['vds (V)', ...STEPS_V.map((v) => `id@vgs=${v}`), 'id@vgs=-1.8'].join(',');
    const rows = VDS_V.map((vds) =>
      [vds, ...STEPS_V.map((vgs) => intrinsicDrainCurrentA(CARD, vgs, vds)), vds <= 8 ? 0 : ''].join(','),
    );
    const curves = parseText([header, ...rows].join('\n')).parts[0].curves;
    expect(curves[0].vgsV).toBe(-1.8);
    expect(curves[0].points.vdsV).toEqual(VDS_V.filter((v) => v <= 8));
  });
});

describe('delimiters, quoting and line ends', () => {
  const plain = (vgs: number, vds: number, id: number) => [vgs, vds, id].map((x) => x.toPrecision(12));
  const comma = (cells: string[]) => cells.map((c) => c.replace('.', ','));

  it.each([
    ['comma, LF', ',', '\n', plain],
    ['semicolon with decimal commas, CRLF', ';', '\r\n', (a: number, b: number, c: number) => comma(plain(a, b, c))],
    ['tab with decimal commas, CR', '\t', '\r', (a: number, b: number, c: number) => comma(plain(a, b, c))],
    ['semicolon with decimal points', ';', '\n', plain],
  ] as const)('%s', (_name, delimiter, eol, cells) => {
    const header = ['vgs (V)', 'vds (V)', 'id (A)'].join(delimiter);
    const parsed = parseText(['# serial: JX-7', header, ...rowsOf(cells, delimiter)].join(eol) + eol);
    expect(parsed.delimiter).toBe(delimiter);
    expectCardFamily(parsed);
  });

  it('quoted cells as RFC 4180 writes them, including a delimiter inside quotes', () => {
    const rows = rowsOf((vgs, vds, id) => ['"JX-7"', `"${vgs}"`, String(vds), `"${id}"`, '"bench 2, ""slot"" 3"']);
    const parsed = parseText(['"serial","VGS (V)","VDS (V)","ID (A)","note"', ...rows].join('\r\n'));
    expect(parsed.parts[0].serial).toBe('JX-7');
    expectCardFamily(parsed);
  });

  it('skips blank lines, rows of empty cells and comments between rows', () => {
    const rows = rowsOf((vgs, vds, id) => [String(vgs), String(vds), String(id)]);
    rows.splice(12, 0, '', ',,', '  # note: retested', ' , , ');
    const parsed = parseText(['vgs,vds,id', ...rows].join('\n'));
    expectCardFamily(parsed);
    expect(parsed.parts[0].metadata.extra).toEqual({ note: 'retested' });
  });

  it('sorts curves by VGS and points by VDS whatever the row order, keeping each line', () => {
    const rows = rowsOf((vgs, vds, id) => [String(vgs), String(vds), String(id)]).reverse();
    const parsed = parseText(['vgs,vds,id', ...rows].join('\n'));
    expectCardFamily(parsed);
    const last = parsed.parts[0].curves[3];
    // Reversed: the first row of the file (line 2) is VGS = 0, VDS = 10.
    expect(last.points.sourceLine.at(-1)).toBe(2);
    expect(last.firstLine).toBe(2);
  });
});

describe('serials, metadata and channel', () => {
  const body = ['vgs,vds,id', ...rowsOf((vgs, vds, id) => [String(vgs), String(vds), String(id)])].join('\n');
  const pBody = ['vgs,vds,id', ...rowsOf((vgs, vds, id) => [String(-vgs), String(vds), String(id)])].join('\n');

  it.each([
    ['lot7/JX-12.csv', 'JX-12'],
    // Serials are upper-cased (src/core/serial/normalize-serial.ts).
    ['C:\\lots\\jx-13.sweep.txt', 'JX-13.SWEEP'],
    ['JX-14', 'JX-14'],
  ])('takes the serial from the file name %s', (fileName, serial) => {
    const part = parseText(body, { fileName }).parts[0];
    expect(part.serial).toBe(serial);
    expect(part.serialSource).toBe('file-name');
  });

  it('refuses a file with no serial anywhere', () => {
    expect(refusalOf(body, { fileName: '.csv' }).code).toBe('missing_column');
  });

  it('reads the metadata aliases', () => {
    const meta = parseText(`# Device-Type: J-demo\n# Temperature (°C): 25 °C\n# Serial Number: JX-20\n# Batch Note: ok\n${body}`).parts[0];
    expect(meta.serial).toBe('JX-20');
    expect(meta.metadata).toEqual({ deviceType: 'J-demo', temperatureC: 25, extra: { batch_note: 'ok' } });
    expect(parseText(`# type: J-x\n${body}`).parts[0].metadata.deviceType).toBe('J-x');
  });

  it('P-channel magnitudes with the channel declared by the caller or the file', () => {
    for (const parsed of [parseText(pBody, { channel: 'p' }), parseText(`# channel: PJF\n${pBody}`)]) {
      expect(parsed.channel).toBe('p');
      expect(parsed.signConvention).toBe('magnitude');
      expectCardFamily(parsed);
    }
  });

  it('refuses P-channel magnitudes without a declared channel, and a caller/file conflict', () => {
    expect(refusalOf(pBody).code).toBe('mixed_signs');
    const conflict = refusalOf(`# channel: p\n${pBody}`, { channel: 'n' });
    expect(conflict.code).toBe('bad_metadata');
    expect(conflict.line).toBe(1);
  });

  it('lets a VDS = 0 offset carry either sign, but not a negative current on a conducting curve', () => {
    // Rule: signs are judged against the part's own noise floor (FORMATS.md, "Signs and channel").
    const maxId = intrinsicDrainCurrentA(CARD, 0, 10);
    const withOffset = ['vgs,vds,id', ...rowsOf((vgs, vds, id) => [String(vgs), String(vds), String(vds === 0 ? -3e-3 * maxId : id)])].join('\n');
    expect(parseText(withOffset).parts[0].curves[0].points.idA[0]).toBeCloseTo(-3e-3 * maxId, 12);
    const flipped = ['vgs,vds,id', ...rowsOf((vgs, vds, id) => [String(vgs), String(vds), String(vgs === 0 && vds === 4 ? -id : id)])].join('\n');
    const error = refusalOf(flipped);
    expect(error.code).toBe('mixed_signs');
    expect(error.field).toBe('ID');
  });

  it('refuses more points than the limit', () => {
    const rows = ['vgs,vds,id'];
    for (let i = 0; i <= MAX_SWEEP_POINTS_PER_FILE; i++) rows.push(`${-(i % 10) / 10},${i / 1000},0.001`);
    const error = refusalOf(rows.join('\n'));
    expect(error.code).toBe('too_large');
    expect(error.line).toBe(MAX_SWEEP_POINTS_PER_FILE + 2);
  });
});

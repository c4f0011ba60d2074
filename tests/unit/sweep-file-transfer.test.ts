import { describe, expect, it } from 'vitest';
import { fitCurveFamily } from '~/core/fit/fit-curve-family';
import { idssA, intrinsicDrainCurrentA, type JfetParams } from '~/core/jfet-model';
import { parseSweepFile, type ParsedSweepPart } from '~/core/sweep-file';

/**
 * Transfer sweeps (ID against VGS at fixed VDS), long and wide, N and P. Currents from the
 * SPICE level-1 model (src/core/jfet-model.ts); the fit must give back VTO and, at the
 * measured VDS, IDSS; with two VDS values also LAMBDA (derived: ID = BETA·(VGS−VTO)²·(1+LAMBDA·VDS)
 * cannot separate BETA from LAMBDA at one VDS, but fixes their product there).
 */
const CARD: JfetParams = { vtoV: -2, betaAPerV2: 1.25e-3, lambdaPerV: 0.02, rsOhm: 0, rdOhm: 0 };
const VGS = Array.from({ length: 23 }, (_, i) => Number((-2.2 + 0.1 * i).toFixed(2)));

const parse = (text: string, channel?: 'n' | 'p') => parseSweepFile({ text, fileName: 'JX-0950.csv', byteLength: text.length, ...(channel ? { channel } : {}) });

function fitPart(part: ParsedSweepPart) {
  const r = fitCurveFamily({ curves: part.curves.map((c) => ({ vgsV: c.vgsV, points: { vdsV: c.points.vdsV, idA: c.points.idA } })) }, { vdsTestV: 10 });
  if (r.status !== 'fitted') throw new Error(r.flags.map((f) => f.message).join(' '));
  return r;
}

describe('transfer sweeps', () => {
  it('long CSV at one VDS: read as a transfer sweep, carried as points per VGS, and fitted', () => {
    const text = ['vgs (V),vds (V),id (mA)', ...VGS.map((vgs) => `${vgs},10,${(intrinsicDrainCurrentA(CARD, vgs, 10) * 1e3).toPrecision(6)}`)].join('\n');
    const part = parse(text).parts[0];
    expect(part.kind).toBe('transfer');
    expect(part.transferCurves).toHaveLength(1);
    expect(part.transferCurves[0].vdsV).toBe(10);
    expect(part.transferCurves[0].points.vgsV).toEqual(VGS);
    expect(part.transferCurves[0].points.sourceLine).toEqual(VGS.map((_, i) => i + 2));
    // The fitter's form: one curve per VGS, each holding the point at VDS = 10 V.
    expect(part.curves.map((c) => c.vgsV)).toEqual(VGS);
    expect(part.curves.every((c) => c.points.vdsV.length === 1 && c.points.vdsV[0] === 10)).toBe(true);
    const r = fitPart(part);
    expect(r.parameters.vtoV.value).toBeCloseTo(CARD.vtoV, 6);
    expect(r.derived.idssA.value / idssA(CARD, 10)).toBeCloseTo(1, 6);
  });

  it('long CSV at two VDS, declared with "# sweep: transfer": LAMBDA comes back too', () => {
    const rows = [5, 10].flatMap((vds) => VGS.map((vgs) => `${vgs},${vds},${intrinsicDrainCurrentA(CARD, vgs, vds)}`));
    const part = parse(['# sweep: transfer', 'vgs,vds,id', ...rows].join('\n')).parts[0];
    expect(part.transferCurves.map((t) => t.vdsV)).toEqual([5, 10]);
    const r = fitPart(part);
    expect(r.parameters.vtoV.value).toBeCloseTo(-2, 6);
    expect(r.parameters.betaAPerV2.value).toBeCloseTo(1.25e-3, 9);
    expect(r.parameters.lambdaPerV.value).toBeCloseTo(0.02, 6);
  });

  it('wide CSV, P-channel in datasheet signs, semicolons and decimal commas: N-equivalent points', () => {
    const header = 'vgs (V);id_mA@vds=-5;id_mA@vds=-10';
    const cell = (v: number) => String(v).replace('.', ',');
    const rows = VGS.map((vgs) => [cell(-vgs), cell(-Number((intrinsicDrainCurrentA(CARD, vgs, 5) * 1e3).toPrecision(8))), cell(-Number((intrinsicDrainCurrentA(CARD, vgs, 10) * 1e3).toPrecision(8)))].join(';'));
    const parsed = parse([header, ...rows].join('\r\n'), 'p');
    expect(parsed.format).toBe('wide-transfer');
    expect(parsed.signConvention).toBe('datasheet');
    const part = parsed.parts[0];
    expect(part.kind).toBe('transfer');
    expect(part.transferCurves.map((t) => [t.vdsV, t.sourceColumn])).toEqual([
      [5, 2],
      [10, 3],
    ]);
    expect(part.transferCurves[1].points.idA[22]).toBeCloseTo(intrinsicDrainCurrentA(CARD, 0, 10), 9);
    expect(fitPart(part).parameters.vtoV.value).toBeCloseTo(-2, 5);
  });

  it('needs 5 gate voltages at one VDS', () => {
    const text = ['# sweep: transfer', 'vgs,vds,id', '-1.5,10,0.0003', '-1,10,0.0012', '-0.5,10,0.0028', '0,10,0.005'].join('\n');
    expect(() => parse(text)).toThrow(
      'JX-0950.csv, line 3 (VGS): part "JX-0950" is a transfer sweep whose longest curve has 4 gate voltages (at VDS = 10 V). Expected at least 5 gate voltages at one VDS, from pinch-off towards VGS = 0.',
    );
  });
});

describe('the FORMATS.md transfer example', () => {
  it('parses as documented and fits to its card (VTO −2 V, BETA 1.25 mA/V², LAMBDA 0.02 /V)', async () => {
    const { readFileSync } = await import('node:fs');
    const doc = readFileSync(new URL('../../src/core/sweep-file/FORMATS.md', import.meta.url), 'utf8');
    const section = doc.slice(doc.indexOf('## Transfer sweeps'));
    const example = section.slice(section.indexOf('```\n') + 4, section.indexOf('\n```', section.indexOf('```\n') + 4));
    const part = parseSweepFile({ text: example, fileName: 'example.csv', byteLength: example.length }).parts[0];
    expect(part.serial).toBe('JX-0301');
    expect(part.kind).toBe('transfer');
    expect(part.transferCurves.map((t) => t.vdsV)).toEqual([5, 10]);
    const r = fitPart(part);
    expect(r.parameters.vtoV.value).toBeCloseTo(-2, 4);
    expect(r.parameters.lambdaPerV.value).toBeCloseTo(0.02, 4);
  });
});

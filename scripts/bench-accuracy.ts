/**
 * npm run bench:accuracy — how true the operating-point figures are on parts that are not
 * square law, against ngspice (Debian package `ngspice`).
 *
 * The parts (tests/fixtures/ngspice/nonsquare-parts.ts): 48 cards, JFET level 2
 * (Parker–Skellern) with Q 1.8–2.5 and level 1 with B 0.45–0.9, half N- and half P-channel,
 * each swept 0–15 V at 8–10 gate steps; plus the same spread as square-law level-1 cards. Each
 * family is fitted as intake fits it (`fitCurveFamily`), clean and with 0.5 % noise of reading
 * plus a 1 µA offset, and read by `partOperatingFigures` at 1 mA / 10 V, 10 % and 50 % of IDSS
 * and VGS = 0. The truth is ngspice's own operating point of a current-forced circuit.
 * Prints, for the measured-data figures and for the level-1 model alone: max and p95 |VGS error|,
 * the p95 ΔVGS error over all same-channel pairs, IDSS error, gm error, and how often the truth
 * lies within 2 stated standard deviations.
 */
import { fitCurveFamily } from '~/core/fit/fit-curve-family';
import { gmAtCurrentS, idssA as modelIdssA, toNEquivalent, vgsAtCurrentV } from '~/core/jfet-model';
import { partOperatingFigures, type PartBasis } from '~/core/operating-point/part-operating-figures';
import { nonSquareParts, simulateParts, squareLawParts, withReadingNoise, type SimulatedPart } from '../tests/fixtures/ngspice/nonsquare-parts';

interface Row { part: SimulatedPart; point: string; err: number; sigma: number; modelErr: number; gmErr: number; modelGmErr: number }

function basis(part: SimulatedPart, noisy: boolean, i: number): PartBasis {
  const fit = fitCurveFamily(noisy ? withReadingNoise(part.family, 1000 + i) : part.family, { vdsTestV: 10 });
  if (fit.status !== 'fitted') throw new Error(`${part.name} did not fit`);
  const p = fit.parameters;
  return {
    params: { vtoV: p.vtoV.value, betaAPerV2: p.betaAPerV2.value, lambdaPerV: p.lambdaPerV.value, rsOhm: p.rsOhm.value, rdOhm: p.rdOhm.value },
    table: fit.operatingTable,
    modelSigmaV: fit.modelVgsSigmaV,
  };
}

const pct = (xs: number[], q: number) => {
  const s = xs.slice().sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(q * s.length))] ?? NaN;
};
const mv = (v: number) => `${(v * 1e3).toFixed(2)} mV`;

function report(label: string, parts: SimulatedPart[]) {
  for (const noisy of [false, true]) {
    const rows: Row[] = [];
    const idssErr: number[] = [];
    const idssModelErr: number[] = [];
    parts.forEach((part, i) => {
      const b = basis(part, noisy, i);
      for (const [point, truth] of [['1 mA', part.at1mA], ['10 % IDSS', part.at10pct], ['50 % IDSS', part.at50pct]] as const) {
        if (!truth) continue;
        const t = toNEquivalent(part.channel, truth.vgsV, 0).vgsV;
        const e = partOperatingFigures(b, { kind: 'current', idA: truth.idA, vdsV: 10 });
        if (!e.usable) throw new Error(`${part.name} at ${point}: ${e.reason}`);
        rows.push({
          part, point,
          err: e.figures.vgsV - t,
          sigma: e.figures.vgsSigmaV,
          modelErr: vgsAtCurrentV(b.params, truth.idA, 10) - t,
          gmErr: e.figures.gmS / truth.gmS - 1,
          modelGmErr: gmAtCurrentS(b.params, truth.idA, 10) / truth.gmS - 1,
        });
      }
      const idss = partOperatingFigures(b, { kind: 'idss', vdsV: 10 });
      if (idss.usable) idssErr.push(Math.abs(idss.figures.idssA / part.idss10A - 1));
      idssModelErr.push(Math.abs(modelIdssA(b.params, 10) / part.idss10A - 1));
    });
    console.log(`\n${label}, ${noisy ? '0.5 % noise of reading + 1 µA offset' : 'clean'} (${parts.length} parts)`);
    for (const point of ['1 mA', '10 % IDSS', '50 % IDSS']) {
      const r = rows.filter((x) => x.point === point);
      const abs = r.map((x) => Math.abs(x.err));
      const mabs = r.map((x) => Math.abs(x.modelErr));
      const pairs: number[] = [];
      const modelPairs: number[] = [];
      for (let a = 0; a < r.length; a++)
        for (let c = a + 1; c < r.length; c++) {
          if (r[a]!.part.channel !== r[c]!.part.channel) continue;
          pairs.push(Math.abs(r[a]!.err - r[c]!.err));
          modelPairs.push(Math.abs(r[a]!.modelErr - r[c]!.modelErr));
        }
      const covered = r.filter((x) => Math.abs(x.err) <= 2 * x.sigma).length / r.length;
      console.log(
        `  VGS at ${point.padEnd(9)} measured: max ${mv(Math.max(...abs))}, p95 ${mv(pct(abs, 0.95))}, pair ΔVGS p95 ${mv(pct(pairs, 0.95))}, ` +
          `within 2σ ${(100 * covered).toFixed(0)} %, median σ ${mv(pct(r.map((x) => x.sigma), 0.5))}, gm max ${(100 * Math.max(...r.map((x) => Math.abs(x.gmErr)))).toFixed(2)} %`,
      );
      console.log(
        `  ${''.padEnd(16)} model:    max ${mv(Math.max(...mabs))}, p95 ${mv(pct(mabs, 0.95))}, pair ΔVGS p95 ${mv(pct(modelPairs, 0.95))}, gm max ${(100 * Math.max(...r.map((x) => Math.abs(x.modelGmErr)))).toFixed(2)} %`,
      );
    }
    console.log(`  IDSS at 10 V: measured max ${(100 * Math.max(...idssErr)).toFixed(3)} %, model max ${(100 * Math.max(...idssModelErr)).toFixed(3)} %`);
  }
}

const t0 = performance.now();
const nonSquare = simulateParts(nonSquareParts());
const square = simulateParts(squareLawParts());
console.log(`simulated ${nonSquare.length + square.length} parts with ngspice in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
report('Not square law (level 2 Parker–Skellern Q 1.8–2.5, level 1 B 0.45–0.9; N and P)', nonSquare);
report('Square law (level 1, B = 1; N and P)', square);
console.log('\nGoals (issue): VGS at 1 mA within 3 mV for every part; pair ΔVGS p95 ≤ 1.5 mV; IDSS within 0.5 %; within 2σ ≥ 90 %.');

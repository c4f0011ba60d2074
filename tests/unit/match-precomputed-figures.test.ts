import { describe, expect, it } from 'vitest';
import { chooseMatchedSets } from '~/core/match/choose-matched-sets';
import { evaluateRange, reusedFigureArrays, type FigureArrays } from '~/core/match/evaluate-at-operating-point';
import type { MatchCandidate, MatchInput } from '~/core/match/match-types';
import { prepareCurves } from '~/core/fit/prepared-curves';
import { buildOperatingTable } from '~/core/operating-point/operating-table';
import { seededRandom } from '~/core/random/seeded-random';

// The server evaluates a large stock in slices on two threads and hands the figures to
// chooseMatchedSets (MatchInput.evaluated). That must change nothing: same sets, same figures,
// same unusable parts with the same reasons, as when chooseMatchedSets evaluates by itself.

/** A power-law family (ID ∝ (VGS − VTO)^m, not square law), as the matching bench uses. */
function candidate(i: number, rand: () => number): MatchCandidate {
  const idssA = 0.6e-3 + rand() * 8e-3; // some below the 1 mA asked: unusable there
  const vtoV = -0.6 - rand() * 2;
  const lambda = 0.002 + rand() * 0.02;
  const m = 2.2 + 0.6 * rand();
  const k = idssA / Math.pow(-vtoV, m);
  const curves = [];
  for (let g = 0; g < 7; g++) {
    const vgs = (vtoV * g) / 6;
    const vov = vgs - vtoV;
    const vdsV: number[] = [];
    const idA: number[] = [];
    for (let v = 0; v <= 15; v += 0.5) {
      const x = vov > 0 ? Math.min(v / vov, 1) : 1;
      vdsV.push(v);
      idA.push(k * Math.pow(Math.max(vov, 0), m) * (1 + lambda * v) * x * (2 - x) * (1 + 0.002 * (rand() - 0.5)));
    }
    curves.push({ vgsV: vgs, points: { vdsV, idA } });
  }
  return {
    id: `PC-${i}`,
    lotId: `L${i % 3}`,
    binCode: null,
    params: { vtoV, betaAPerV2: idssA / (vtoV * vtoV), lambdaPerV: lambda, rsOhm: 0, rdOhm: 0 },
    table: i % 5 === 0 ? null : buildOperatingTable(prepareCurves({ curves }), vtoV),
    measuredAtC: 23 + 4 * rand(),
    tempco: { vtotcVPerC: -0.0022, betatcePctPerC: -0.7 },
    modelSigmaV: 0.004,
  };
}

const rand = seededRandom(20261202);
const candidates = Array.from({ length: 300 }, (_, i) => candidate(i, rand));

function evaluatedInTwoSlices(input: MatchInput): { figures: FigureArrays; unusable: Uint8Array } {
  const n = input.candidates.length;
  // Own copies: the reused arrays are the matcher's working memory.
  const work = reusedFigureArrays(n);
  const unusable = new Uint8Array(n);
  const half = n >> 1;
  evaluateRange(input.candidates, input.operatingPoint, input.temperatureC, work, unusable, half, n);
  evaluateRange(input.candidates, input.operatingPoint, input.temperatureC, work, unusable, 0, half);
  const figures = Object.fromEntries(Object.entries(work).map(([k, a]) => [k, a.slice()])) as unknown as FigureArrays;
  return { figures, unusable };
}

describe('matching on figures computed beforehand (MatchInput.evaluated)', () => {
  const requests: MatchInput[] = [
    { candidates, operatingPoint: { kind: 'current', idA: 1e-3, vdsV: 10 }, shape: 'pair', count: 20, tolerances: { maxDvgsV: 0.01, maxGmMismatch: 0.05, maxIdssMismatch: Infinity, cascodeMarginV: 0 }, temperatureC: 30 },
    { candidates, operatingPoint: { kind: 'self_bias', rsOhm: 470, vdsV: 12 }, shape: 'quad', count: 5, tolerances: { maxDvgsV: 0.02, maxGmMismatch: Infinity, maxIdssMismatch: Infinity, cascodeMarginV: 0 } },
    { candidates, operatingPoint: { kind: 'current', idA: 0.8e-3, vdsV: 9 }, shape: 'matched_cascode_pairs', count: 3, tolerances: { maxDvgsV: 0.02, maxGmMismatch: Infinity, maxIdssMismatch: Infinity, cascodeMarginV: 0.2 }, options: { sameLot: true } },
  ];
  for (const request of requests) {
    it(`gives the same answer for ${request.shape} at ${request.operatingPoint.kind}`, () => {
      const alone = chooseMatchedSets(request);
      const given = chooseMatchedSets({ ...request, evaluated: evaluatedInTwoSlices(request) });
      expect(alone.sets.length).toBeGreaterThan(0);
      // At 1 mA or less some parts (IDSS from 0.6 mA) cannot run; self-bias suits every part.
      expect(alone.unusable.length > 0).toBe(request.operatingPoint.kind === 'current');
      expect(given).toEqual(alone);
    });
  }

  it('refuses figures that belong to another stock', () => {
    const request = requests[0]!;
    const evaluated = evaluatedInTwoSlices({ ...request, candidates: candidates.slice(0, 100) });
    expect(() => chooseMatchedSets({ ...request, evaluated })).toThrow(/cover 100 parts but the match was given 300/);
  });
});

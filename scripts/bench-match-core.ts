/**
 * Times the pure matched-set picker: 100 000 random N-channel candidates (IDSS 1–20 mA,
 * VTO −0.5 to −4 V, LAMBDA 0.002–0.03 /V, invented), 50 pairs at 1 mA, VDS 10 V, |ΔVGS| ≤ 10 mV.
 * Each run uses a slightly different current so nothing is reused between runs; three
 * uncounted warm-up runs first (a running server's code is already compiled).
 * Run: npx tsx scripts/bench-match-core.ts [runs]
 */
import { chooseMatchedSets } from '~/core/match/choose-matched-sets';
import type { MatchCandidate, MatchTolerances } from '~/core/match/match-types';
import { seededRandom } from '~/core/random/seeded-random';

const rand = seededRandom(20261201);
const candidates: MatchCandidate[] = Array.from({ length: 100_000 }, (_, i) => {
  const idss = 1e-3 + rand() * 19e-3;
  const vto = -0.5 - rand() * 3.5;
  return {
    id: `SL-${String(i).padStart(6, '0')}`,
    lotId: `L${i % 40}`,
    binCode: null,
    params: {
      vtoV: vto,
      betaAPerV2: idss / (vto * vto),
      lambdaPerV: 0.002 + rand() * 0.028,
      rsOhm: 0,
      rdOhm: 0,
    },
  };
});

const runs = Number(process.argv[2] ?? 31);
const scenarios: { name: string; tol: MatchTolerances }[] = [
  {
    name: '|ΔVGS| ≤ 10 mV only',
    tol: { maxDvgsV: 10e-3, maxGmMismatch: Infinity, maxIdssMismatch: Infinity, cascodeMarginV: 0 },
  },
  {
    name: '|ΔVGS| ≤ 10 mV, gm ratio ≥ 0.97, IDSS ratio ≥ 0.95',
    tol: { maxDvgsV: 10e-3, maxGmMismatch: 0.03, maxIdssMismatch: 0.05, cascodeMarginV: 0 },
  },
];

for (const { name, tol } of scenarios) {
  const times: number[] = [];
  let last = null as ReturnType<typeof chooseMatchedSets> | null;
  for (let r = -3; r < runs; r++) {
    const t0 = performance.now();
    last = chooseMatchedSets({
      candidates,
      operatingPoint: { kind: 'current', idA: 1e-3 * (1 + r * 1e-4), vdsV: 10 },
      shape: 'pair',
      count: 50,
      tolerances: tol,
    });
    if (r < 0) continue; // warm-up: a running server has its code compiled already
    times.push(performance.now() - t0);
    if (process.env.BENCH_VERBOSE) console.log(`  run ${r}: ${times.at(-1)!.toFixed(1)} ms`);
  }
  times.sort((a, b) => a - b);
  const pct = (p: number) => times[Math.min(times.length - 1, Math.ceil(p * times.length) - 1)]!;
  console.log(`${name}: ${runs} runs, 100000 candidates, 50 pairs at 1 mA, 10 V`);
  console.log(`  median ${pct(0.5).toFixed(1)} ms, p95 ${pct(0.95).toFixed(1)} ms, max ${times.at(-1)!.toFixed(1)} ms`);
  console.log(
    `  last run: ${last!.sets.length} pairs, total cost ${last!.totalCost.toExponential(3)}, ` +
      `worst ΔVGS ${(Math.max(...last!.sets.map((s) => s.dvgsV)) * 1e6).toFixed(2)} µV, guarantee ${last!.guarantee.kind}`,
  );
}

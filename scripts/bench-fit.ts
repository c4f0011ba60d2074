/**
 * Fit speed against SciPy, side by side in one run: `npx tsx scripts/bench-fit.ts [N]`.
 * N noisy copies (0.3 % of IDSS, seeded) of the ngspice 9-curve × 61-point family
 * njf-medium are fitted by fitCurveFamily (level-1, as SciPy does) and by
 * /usr/bin/python3 scipy.optimize.least_squares(method='lm') from the same starting values.
 * Prints time per fit and the accuracy of both against the netlist's card, the same fits
 * with the library handed every data row instead of the compressed rows, and the time per
 * fit of extended='auto' on that level-1 family and on noisy copies of the RS/RD card
 * njf-series, with how often the RS/RD model was kept and how often the screen left it out.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { performance } from 'node:perf_hooks';
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import type { CurveFamily } from '~/core/fit/definitions.ts';
import { fitCurveFamily } from '~/core/fit/fit-curve-family.ts';
import { prepareCurves } from '~/core/fit/prepared-curves.ts';
import { estimateStartingValues } from '~/core/fit/starting-values.ts';
import { maxCurrentA, readCommittedFamily, readNetlistTruth, withNoise } from '../tests/fixtures/ngspice/ngspice-fixtures.ts';

const N = Number(process.argv[2] ?? 200);
const FIXTURE = 'njf-medium';
const SCRIPT = fileURLToPath(new URL('../tests/fixtures/scipy/fit_level1.py', import.meta.url));

const clean = readCommittedFamily(FIXTURE);
const truth = readNetlistTruth(FIXTURE).params;
const families: CurveFamily[] = Array.from({ length: N }, (_, i) => withNoise(clean, 0.003 * maxCurrentA(clean), 1 + i));
const pointsPerFamily = clean.curves.reduce((s, c) => s + c.points.idA.length, 0);

/** RS/RD fixture for the auto-mode timing on parts that need the extended model. */
const SERIES_FIXTURE = 'njf-series';
const seriesClean = readCommittedFamily(SERIES_FIXTURE);
const seriesFamilies: CurveFamily[] = Array.from({ length: N }, (_, i) =>
  withNoise(seriesClean, 0.003 * maxCurrentA(seriesClean), 1 + i),
);

/** Best of `rounds` passes over all families (the machine is shared; the minimum is the cost). */
function timeJs(extended: 'never' | 'auto', rounds = 3, set: CurveFamily[] = families, solverRows: 'compressed' | 'full' = 'compressed') {
  for (const f of set) fitCurveFamily(f, { vdsTestV: 10, extended, solverRows }); // warm-up
  let best = Infinity;
  let results = [] as ReturnType<typeof fitCurveFamily>[];
  for (let r = 0; r < rounds; r++) {
    const t0 = performance.now();
    results = set.map((f) => fitCurveFamily(f, { vdsTestV: 10, extended, solverRows }));
    best = Math.min(best, (performance.now() - t0) / set.length);
  }
  return { msPerFit: best, results };
}

/** How auto mode decided: extended model kept, and (when the engine reports it) screened out. */
function autoOutcome(results: ReturnType<typeof fitCurveFamily>[]) {
  let kept = 0;
  let screened = 0;
  for (const r of results) {
    if (r.status !== 'fitted') continue;
    if (r.model === 'level1+rs_rd') kept++;
    if ((r.extendedTest as { screened?: boolean } | null)?.screened) screened++;
  }
  return `RS/RD kept ${kept}/${results.length}, screened out ${screened}/${results.length}`;
}

/** The library's own cost: 2 iterations on n rows whose model values and Jacobian rows are precomputed. */
function timeLibraryAlone(n: number, rounds = 3) {
  const x = Float64Array.from({ length: n }, (_, i) => i);
  const y = Float64Array.from(x, (i) => Math.sin(i));
  const f = Float64Array.from(x, (i) => Math.sin(i) + 1e-3);
  const row = [0.5, 0.25, 0.125];
  const run = () =>
    levenbergMarquardt({ x, y }, () => (i) => f[i], {
      initialValues: [1, 1, 1],
      maxIterations: 2,
      errorTolerance: 0,
      jacobianFunction: () => () => row,
    });
  for (let i = 0; i < N; i++) run();
  let best = Infinity;
  for (let r = 0; r < rounds; r++) {
    const t0 = performance.now();
    for (let i = 0; i < N; i++) run();
    best = Math.min(best, (performance.now() - t0) / N);
  }
  return best;
}

const libraryFullMs = timeLibraryAlone(pointsPerFamily);
const libraryCompressedMs = timeLibraryAlone(4);
const jsFullRows = timeJs('never', 3, families, 'full');
const js = timeJs('never');
const jsAuto = timeJs('auto');
const jsAutoSeries = timeJs('auto', 3, seriesFamilies);
const jsParams = js.results.map((r) => {
  if (r.status !== 'fitted') throw new Error('a bench family did not fit');
  return [r.parameters.vtoV.value, r.parameters.betaAPerV2.value, r.parameters.lambdaPerV.value];
});
const iterations = js.results.map((r) => (r.status === 'fitted' ? r.quality.iterations : NaN));

const request = {
  model: 'level1',
  repeat: 1,
  families: families.map((f) => {
    const s = estimateStartingValues(prepareCurves(f))!;
    return {
      vgs: f.curves.flatMap((c) => c.points.vdsV.map(() => c.vgsV)),
      vds: f.curves.flatMap((c) => c.points.vdsV),
      id: f.curves.flatMap((c) => c.points.idA),
      start: [s.vtoV, s.betaAPerV2, s.lambdaPerV],
    };
  }),
};
// Five SciPy runs interleaved with JS runs; each side keeps its best (the machine is shared).
let scipy: { scipy: string; seconds_per_fit: number; results: { params: number[] }[] } | null = null;
let jsBest = js.msPerFit;
for (let round = 0; round < 5; round++) {
  const run = spawnSync('/usr/bin/python3', [SCRIPT], { input: JSON.stringify(request), encoding: 'utf8', maxBuffer: 1 << 26 });
  if (run.status !== 0) throw new Error(`SciPy run failed (apt-get install python3-scipy?): ${run.stderr}`);
  const next = JSON.parse(run.stdout);
  if (!scipy || next.seconds_per_fit < scipy.seconds_per_fit) scipy = next;
  jsBest = Math.min(jsBest, timeJs('never', 1).msPerFit);
}
if (!scipy) throw new Error('no SciPy run');
const scipyParams: number[][] = scipy.results.map((r: { params: number[] }) => r.params);

const truthVector = [truth.vtoV, truth.betaAPerV2, truth.lambdaPerV];
const names = ['VTO', 'BETA', 'LAMBDA'];
const rmsRelError = (ps: number[][], k: number) =>
  Math.sqrt(ps.reduce((s, p) => s + (p[k] / truthVector[k] - 1) ** 2, 0) / ps.length);
const maxDisagreement = Math.max(...jsParams.flatMap((p, i) => p.map((v, k) => Math.abs(v / scipyParams[i][k] - 1))));

const lines = [
  `families: ${N} × ${clean.curves.length} curves × ${pointsPerFamily / clean.curves.length} points (${FIXTURE}, noise 0.3 % of IDSS)`,
  `SciPy ${scipy.scipy} least_squares(method='lm'): ${(scipy.seconds_per_fit * 1e3).toFixed(3)} ms per fit`,
  `fitCurveFamily extended='never' (level-1, like SciPy): ${jsBest.toFixed(3)} ms per fit, ` +
    `${(jsBest / (scipy.seconds_per_fit * 1e3)).toFixed(3)} × SciPy's time (target ≤ 0.25), ` +
    `library iterations mean ${(iterations.reduce((a, b) => a + b, 0) / N).toFixed(2)}`,
  `  ml-levenberg-marquardt's own work for 2 iterations (model precomputed): ${libraryCompressedMs.toFixed(3)} ms on the 4 compressed rows, ${libraryFullMs.toFixed(3)} ms on all ${pointsPerFamily} rows`,
  `  the same fits handing the library all ${pointsPerFamily} rows (solverRows 'full'): ${jsFullRows.msPerFit.toFixed(3)} ms per fit`,
  `fitCurveFamily extended='auto' on ${FIXTURE} (level-1 card): ${jsAuto.msPerFit.toFixed(3)} ms per fit, ${autoOutcome(jsAuto.results)}`,
  `fitCurveFamily extended='auto' on ${SERIES_FIXTURE} (RS/RD card): ${jsAutoSeries.msPerFit.toFixed(3)} ms per fit, ${autoOutcome(jsAutoSeries.results)}`,
  'accuracy, RMS relative error against the card over all families (JS | SciPy):',
  ...names.map((n, k) => `  ${n.padEnd(6)} ${rmsRelError(jsParams, k).toExponential(3)} | ${rmsRelError(scipyParams, k).toExponential(3)}`),
  `largest JS/SciPy parameter disagreement: ${maxDisagreement.toExponential(2)} relative`,
];
console.log(lines.join('\n'));

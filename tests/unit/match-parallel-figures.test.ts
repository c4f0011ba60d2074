import { afterAll, describe, expect, it } from 'vitest';
import { chooseMatchedSets } from '~/core/match/choose-matched-sets';
import type { MatchCandidate, MatchInput } from '~/core/match/match-types';
import { prepareCurves } from '~/core/fit/prepared-curves';
import { buildOperatingTable, operatingTableFromBytes, operatingTableToBytes } from '~/core/operating-point/operating-table';
import { seededRandom } from '~/core/random/seeded-random';
import type { TypeStock } from '~/lib/server/services/match/candidate-cache';
import { BASIS_FLOATS, packBasis } from '~/lib/server/services/match/packed-bases';
import { stopFigureThreads, withStockFigures } from '~/lib/server/services/match/parallel-figures';

// The web server evaluates a large stock's figures on worker threads (figures-worker.ts, started
// the way the server starts it) and hands them to chooseMatchedSets. The proposal must be the
// one a single thread gives: same sets, same figures, same unusable parts.

process.env.BETTER_AUTH_SECRET ??= 'a test secret of at least thirty-two characters';
process.env.SLUICE_MATCH_THREADS = '1';

const rand = seededRandom(7);
const N = 5000;

/** A stock as the candidate cache builds it: tables and bases in shared memory. */
function buildStock(): TypeStock {
  const bytes: Uint8Array[] = [];
  const rows: Omit<MatchCandidate, 'table'>[] = [];
  for (let i = 0; i < N; i++) {
    const idssA = 0.7e-3 + rand() * 6e-3;
    const vtoV = -0.6 - rand() * 2;
    const m = 2.2 + 0.6 * rand();
    const k = idssA / Math.pow(-vtoV, m);
    const curves = [];
    for (let g = 0; g < 5; g++) {
      const vgs = (vtoV * g) / 4;
      const vdsV = [0, 2, 4, 6, 8, 10, 12, 14];
      curves.push({ vgsV: vgs, points: { vdsV, idA: vdsV.map((v) => k * Math.pow(vgs - vtoV, m) * (1 + 0.01 * v) * Math.min(1, v / (vgs - vtoV || 1))) } });
    }
    const table = i % 7 === 0 ? null : buildOperatingTable(prepareCurves({ curves }), vtoV);
    bytes.push(table ? operatingTableToBytes(table) : new Uint8Array(0));
    rows.push({
      id: `TH-${i}`,
      lotId: null,
      binCode: null,
      params: { vtoV, betaAPerV2: idssA / (vtoV * vtoV), lambdaPerV: 0.01, rsOhm: 0, rdOhm: 0 },
      measuredAtC: 24 + 2 * rand(),
      tempco: { vtotcVPerC: -0.0022, betatcePctPerC: -0.7 },
      modelSigmaV: 0.003,
    });
  }
  const tables = new Float64Array(new SharedArrayBuffer(bytes.reduce((s, b) => s + b.byteLength, 0)));
  const bases = new Float64Array(new SharedArrayBuffer(8 * BASIS_FLOATS * N));
  let at = 0;
  const candidates = rows.map((r, i) => {
    const c: MatchCandidate = { ...r, table: bytes[i]!.byteLength ? operatingTableFromBytes(bytes[i]!, tables, at) : null };
    at += bytes[i]!.byteLength / 8;
    packBasis(c, bases, i);
    return c;
  });
  return {
    deviceTypeId: 1, key: 1, version: 'test', partIds: new Int32Array(N), binIds: new Int32Array(N),
    candidates, shared: { tables, bases }, slotBySerial: new Map(), builtAt: new Date(), noticeMark: null,
  };
}

afterAll(async () => {
  await stopFigureThreads();
});

describe('figures evaluated on a worker thread', () => {
  it('give the proposal a single thread gives', async () => {
    const stock = buildStock();
    const input: MatchInput = {
      candidates: stock.candidates,
      operatingPoint: { kind: 'current', idA: 1e-3, vdsV: 10 },
      shape: 'pair',
      count: 40,
      tolerances: { maxDvgsV: 0.005, maxGmMismatch: 0.05, maxIdssMismatch: Infinity, cascodeMarginV: 0 },
      temperatureC: 28,
    };
    const alone = chooseMatchedSets(input);
    // The first requests start the thread and run alone; wait until it takes its slice.
    let threaded = false;
    let result = alone;
    for (let i = 0; i < 300 && !threaded; i++) {
      result = await withStockFigures(stock, stock.candidates, input.operatingPoint, input.temperatureC, (evaluated) => {
        threaded = evaluated !== undefined;
        return chooseMatchedSets({ ...input, evaluated });
      });
      if (!threaded) await new Promise((r) => setTimeout(r, 100));
    }
    expect(threaded).toBe(true);
    expect(alone.sets.length).toBe(40);
    expect(alone.unusable.length).toBeGreaterThan(0);
    expect(result).toEqual(alone);
  }, 60_000);
});

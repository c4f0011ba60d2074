import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import { evaluateRange, firstSlots, type FigureArrays } from '~/core/match/evaluate-at-operating-point';
import type { MatchCandidate, MatchInput, OperatingPoint } from '~/core/match/match-types';
import { storableErrorMessage } from '~/core/text/storable-text';
import { serverEnv } from '~/lib/server/env';
import type { TypeStock } from './candidate-cache';
import type { FiguresWorkerMessage, FiguresWorkerReply } from './figures-worker';

/**
 * Matching a large stock evaluates every part's figures at the designer's operating point
 * (~0.45 µs a part). Here that work is split: worker threads (`SLUICE_MATCH_THREADS`,
 * figures-worker.ts) each take a slice of the stock, the request's own thread takes the first
 * slice, and all write into shared arrays that `chooseMatchedSets` receives as
 * `MatchInput.evaluated`. The same core function computes every slice, so the figures are the
 * ones a single thread would give (tests/unit/match-precomputed-figures.test.ts).
 *
 * Anything amiss — threads turned off or not started yet, a small stock, a subset of the stock,
 * a thread that fails or does not answer — and the request evaluates on its own thread, as
 * before. A thread that fails is replaced after a minute.
 */

/** Below this many parts a hand-over costs more than it saves. */
const MIN_PARTS = 4096;
const REPLY_TIMEOUT_MS = 10_000;
const START_TIMEOUT_MS = 60_000;
const RETRY_AFTER_MS = 60_000;
const WORKER_ENTRY = 'src/lib/server/services/match/figures-worker.ts';
// Worker threads do not inherit the TypeScript loader: each registers tsx, then loads the entry.
const BOOT = `const { workerData } = require('node:worker_threads');
import('tsx/esm/api').then(({ register }) => { register(); return import(workerData.entry); });`;

interface Helper {
  worker: Worker;
  ready: boolean;
  /** The build of each type this thread holds (it keeps one per type). */
  stockOfType: Map<number, number>;
  pending: Map<number, { resolve: () => void; reject: (err: Error) => void }>;
}

let helpers: Helper[] = [];
let retryAt = 0;
let nextId = 0;
let turn: Promise<void> = Promise.resolve();
let shared: { capacity: number; figures: FigureArrays; unusable: Uint8Array } | null = null;

function failHelper(h: Helper, err: Error): void {
  if (!helpers.includes(h)) return;
  helpers = helpers.filter((x) => x !== h);
  retryAt = Date.now() + RETRY_AFTER_MS;
  console.error(`[match] a figures thread stopped (${storableErrorMessage(err)}); requests evaluate on their own thread meanwhile`);
  for (const p of h.pending.values()) p.reject(err);
  h.pending.clear();
  void h.worker.terminate();
}

function startHelper(entry: string): Helper {
  const worker = new Worker(BOOT, { eval: true, workerData: { entry: pathToFileURL(entry).href } });
  worker.unref();
  const h: Helper = { worker, ready: false, stockOfType: new Map(), pending: new Map() };
  const startTimer = setTimeout(() => failHelper(h, new Error('it did not start within a minute')), START_TIMEOUT_MS);
  startTimer.unref();
  worker.on('message', (m: FiguresWorkerReply) => {
    if (m.type === 'ready') {
      clearTimeout(startTimer);
      h.ready = true;
      return;
    }
    const p = h.pending.get(m.id);
    h.pending.delete(m.id);
    if (m.type === 'done') p?.resolve();
    else p?.reject(new Error(m.message));
  });
  worker.on('error', (err) => failHelper(h, err));
  worker.on('exit', (code) => failHelper(h, new Error(`it exited with code ${code}`)));
  return h;
}

/** The threads ready now; starts the missing ones (they help from a later request on). */
function readyHelpers(): Helper[] {
  const want = serverEnv().matchThreads;
  if (helpers.length < want && Date.now() >= retryAt) {
    const entry = path.join(process.cwd(), WORKER_ENTRY);
    if (!fs.existsSync(entry)) {
      retryAt = Infinity;
      console.error(`[match] ${WORKER_ENTRY} is not under ${process.cwd()}: matching runs on one thread`);
    } else {
      while (helpers.length < want) helpers.push(startHelper(entry));
    }
  }
  return helpers.filter((h) => h.ready);
}

function sharedArrays(n: number): { figures: FigureArrays; unusable: Uint8Array } {
  if (!shared || shared.capacity < n) {
    const capacity = Math.ceil(n * 1.25);
    const f64 = () => new Float64Array(new SharedArrayBuffer(8 * capacity));
    shared = {
      capacity,
      figures: {
        idA: f64(),
        vgsV: f64(),
        gmS: f64(),
        gosS: f64(),
        idssA: f64(),
        vdsSatV: f64(),
        vgsSigmaV: f64(),
        measured: new Uint8Array(new SharedArrayBuffer(capacity)),
        temperatureShiftV: f64(),
      },
      unusable: new Uint8Array(new SharedArrayBuffer(capacity)),
    };
  }
  return {
    figures: firstSlots(shared.figures, n),
    unusable: shared.unusable.subarray(0, n),
  };
}

function ask(h: Helper, msg: Extract<FiguresWorkerMessage, { type: 'evaluate' }>): Promise<void> {
  return new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => failHelper(h, new Error(`no answer within ${REPLY_TIMEOUT_MS / 1000} s`)), REPLY_TIMEOUT_MS);
    timer.unref();
    h.pending.set(msg.id, {
      resolve: () => (clearTimeout(timer), resolve()),
      reject: (err) => (clearTimeout(timer), reject(err)),
    });
    h.worker.postMessage(msg);
  });
}

/** Every candidate's figures at `op`, in slices on the ready threads and this one; null: none ready. */
async function evaluateInSlices(stock: TypeStock, op: OperatingPoint, compareAtC: number | undefined): Promise<MatchInput['evaluated'] | null> {
  const ready = readyHelpers();
  if (ready.length === 0) return null;
  const n = stock.candidates.length;
  const out = sharedArrays(n);
  const size = Math.ceil(n / (ready.length + 1));
  const replies = ready.map((h, k) => {
    if (h.stockOfType.get(stock.deviceTypeId) !== stock.key) {
      h.worker.postMessage({
        type: 'stock',
        key: stock.key,
        deviceTypeId: stock.deviceTypeId,
        tables: stock.shared.tables,
        bases: stock.shared.bases,
        count: n,
      } satisfies FiguresWorkerMessage);
      h.stockOfType.set(stock.deviceTypeId, stock.key);
    }
    const from = Math.min(n, (k + 1) * size);
    return ask(h, { type: 'evaluate', id: ++nextId, key: stock.key, op, compareAtC, from, to: Math.min(n, from + size), ...out });
  });
  evaluateRange(stock.candidates, op, compareAtC, out.figures, out.unusable, 0, Math.min(n, size));
  const settled = await Promise.allSettled(replies);
  settled.forEach((r, k) => {
    if (r.status === 'fulfilled') return;
    // That thread's slice, here instead.
    const from = Math.min(n, (k + 1) * size);
    evaluateRange(stock.candidates, op, compareAtC, out.figures, out.unusable, from, Math.min(n, from + size));
  });
  return out;
}

/**
 * Runs `choose` (synchronous: `chooseMatchedSets`) with the candidates' figures evaluated on
 * several threads when that helps, else with none (the core then evaluates them itself). One
 * request at a time uses the shared arrays, from evaluation to the end of `choose`.
 */
export async function withStockFigures<T>(
  stock: TypeStock,
  candidates: readonly MatchCandidate[],
  op: OperatingPoint,
  compareAtC: number | undefined,
  choose: (evaluated: MatchInput['evaluated']) => T,
): Promise<T> {
  if (candidates !== stock.candidates || candidates.length < MIN_PARTS || serverEnv().matchThreads === 0) return choose(undefined);
  const previous = turn;
  let release!: () => void;
  turn = new Promise<void>((r) => (release = r));
  await previous;
  try {
    const evaluated = await evaluateInSlices(stock, op, compareAtC);
    return choose(evaluated ?? undefined);
  } finally {
    release();
  }
}

/** Stops the threads (tests; a server lets them end with the process). */
export async function stopFigureThreads(): Promise<void> {
  const all = helpers;
  helpers = [];
  await Promise.all(all.map((h) => h.worker.terminate()));
}

/**
 * A worker thread that evaluates a slice of a stock's figures for matching (see
 * parallel-figures.ts). It holds the bases of the stocks it was sent, read from shared memory,
 * and writes figures into shared arrays; the main thread evaluates the other slice meanwhile.
 */
import { parentPort } from 'node:worker_threads';
import { AppError } from '~/core/errors';
import { evaluateRange, type FigureArrays } from '~/core/match/evaluate-at-operating-point';
import type { OperatingPoint } from '~/core/match/match-types';
import type { PartBasis } from '~/core/operating-point/part-operating-figures';
import { storableErrorMessage } from '~/core/text/storable-text';
import { unpackBases } from './packed-bases';

export type FiguresWorkerMessage =
  | { type: 'stock'; key: number; tables: Float64Array; bases: Float64Array; count: number }
  | {
      type: 'evaluate';
      id: number;
      key: number;
      op: OperatingPoint;
      compareAtC: number | undefined;
      from: number;
      to: number;
      figures: FigureArrays;
      unusable: Uint8Array;
    };

export type FiguresWorkerReply = { type: 'ready' } | { type: 'done'; id: number } | { type: 'failed'; id: number; message: string };

// The stocks this thread holds: the latest few builds (older ones are no longer asked for).
const stocks = new Map<number, PartBasis[]>();
const KEEP_STOCKS = 4;

const port = parentPort!;
port.on('message', (msg: FiguresWorkerMessage) => {
  if (msg.type === 'stock') {
    stocks.set(msg.key, unpackBases(msg.bases, msg.tables, msg.count));
    while (stocks.size > KEEP_STOCKS) stocks.delete(stocks.keys().next().value!);
    return;
  }
  try {
    const parts = stocks.get(msg.key);
    if (!parts) throw new AppError('match_thread_stock_missing', { key: msg.key });
    evaluateRange(parts, msg.op, msg.compareAtC, msg.figures, msg.unusable, msg.from, msg.to);
    port.postMessage({ type: 'done', id: msg.id } satisfies FiguresWorkerReply);
  } catch (err) {
    port.postMessage({ type: 'failed', id: msg.id, message: storableErrorMessage(err) } satisfies FiguresWorkerReply);
  }
});
port.postMessage({ type: 'ready' } satisfies FiguresWorkerReply);

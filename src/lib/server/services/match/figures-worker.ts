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
  | { type: 'stock'; key: number; deviceTypeId: number; tables: Float64Array; bases: Float64Array; count: number }
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

// The stocks this thread holds: the latest build of each type, so an older build's tables
// (shared memory, ~100 MB for 100 000 parts) are freed once the main thread drops them too.
const stocks = new Map<number, { key: number; parts: PartBasis[] }>();
const typeOfKey = new Map<number, number>();

const port = parentPort!;
port.on('message', (msg: FiguresWorkerMessage) => {
  if (msg.type === 'stock') {
    const old = stocks.get(msg.deviceTypeId);
    if (old) typeOfKey.delete(old.key);
    stocks.set(msg.deviceTypeId, { key: msg.key, parts: unpackBases(msg.bases, msg.tables, msg.count) });
    typeOfKey.set(msg.key, msg.deviceTypeId);
    return;
  }
  try {
    const type = typeOfKey.get(msg.key);
    const parts = type === undefined ? undefined : stocks.get(type)?.parts;
    if (!parts) throw new AppError('match_thread_stock_missing', { key: msg.key });
    evaluateRange(parts, msg.op, msg.compareAtC, msg.figures, msg.unusable, msg.from, msg.to);
    port.postMessage({ type: 'done', id: msg.id } satisfies FiguresWorkerReply);
  } catch (err) {
    port.postMessage({ type: 'failed', id: msg.id, message: storableErrorMessage(err) } satisfies FiguresWorkerReply);
  }
});
port.postMessage({ type: 'ready' } satisfies FiguresWorkerReply);

import type { PartStatus } from './part-transitions';

/** The states that count towards a bin's figures; every other state is not on a shelf. */
export const COUNTED_STATUSES = { in_stock: 'onHand', reserved: 'reserved', issued: 'issued' } as const satisfies Partial<Record<PartStatus, string>>;

export interface BinCounts {
  onHand: number;
  reserved: number;
  issued: number;
}

/** Folds (status, count) rows of one bin — the result of a GROUP BY — into its counts. */
export function countsFromStatusRows(rows: readonly { status: PartStatus | string; count: number }[]): BinCounts {
  const out: BinCounts = { onHand: 0, reserved: 0, issued: 0 };
  for (const r of rows) {
    const key = (COUNTED_STATUSES as Record<string, keyof BinCounts | undefined>)[r.status];
    if (key) out[key] += Number(r.count);
  }
  return out;
}

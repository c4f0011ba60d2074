export interface BinShare {
  code: string;
  count: number;
  /** count / number of parts; null when there are no parts. */
  share: number | null;
}

/**
 * Parts per bin code. With `catalogueCodes` (e.g. binCatalogue(plan).map(e => e.code)) every
 * bin is listed in that order, empty ones with count 0; codes not in it follow, sorted.
 */
export function binShares(partCodes: readonly string[], catalogueCodes: readonly string[] = []): BinShare[] {
  const counts = new Map<string, number>();
  for (const c of catalogueCodes) counts.set(c, 0);
  const extra = new Set<string>();
  for (const code of partCodes) {
    if (!counts.has(code)) extra.add(code);
    counts.set(code, (counts.get(code) ?? 0) + 1);
  }
  const n = partCodes.length;
  const order = [...new Set(catalogueCodes), ...[...extra].sort()];
  return order.map((code) => ({ code, count: counts.get(code) ?? 0, share: n > 0 ? (counts.get(code) ?? 0) / n : null }));
}

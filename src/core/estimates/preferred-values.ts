/**
 * Preferred resistor values of IEC 60063 (the E series). The tables are the standard's
 * published values, not the rounded formula: E24 departs from round(10^(i/24)) at 2.7, 3.0,
 * 3.3, 3.6, 3.9, 4.3, 4.7 and 8.2.
 */
export const E24 = [1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1] as const;

export const E96 = [
  1.0, 1.02, 1.05, 1.07, 1.1, 1.13, 1.15, 1.18, 1.21, 1.24, 1.27, 1.3, 1.33, 1.37, 1.4, 1.43, 1.47, 1.5, 1.54, 1.58, 1.62, 1.65, 1.69, 1.74,
  1.78, 1.82, 1.87, 1.91, 1.96, 2.0, 2.05, 2.1, 2.15, 2.21, 2.26, 2.32, 2.37, 2.43, 2.49, 2.55, 2.61, 2.67, 2.74, 2.8, 2.87, 2.94, 3.01, 3.09,
  3.16, 3.24, 3.32, 3.4, 3.48, 3.57, 3.65, 3.74, 3.83, 3.92, 4.02, 4.12, 4.22, 4.32, 4.42, 4.53, 4.64, 4.75, 4.87, 4.99, 5.11, 5.23, 5.36, 5.49,
  5.62, 5.76, 5.9, 6.04, 6.19, 6.34, 6.49, 6.65, 6.81, 6.98, 7.15, 7.32, 7.5, 7.68, 7.87, 8.06, 8.25, 8.45, 8.66, 8.87, 9.09, 9.31, 9.53, 9.76,
] as const;

export type ESeries = 'E24' | 'E96';
const TABLES: Record<ESeries, readonly number[]> = { E24, E96 };

/**
 * The preferred value nearest to `ohms` in ratio (the E series are spaced evenly on a log
 * scale, so "nearest" means the smallest |log(value/ohms)|). Null for a value ≤ 0 or not finite.
 */
export function nearestPreferredValue(ohms: number, series: ESeries): number | null {
  if (!(ohms > 0) || !Number.isFinite(ohms)) return null;
  const decade = 10 ** Math.floor(Math.log10(ohms));
  let best = NaN;
  let bestDistance = Infinity;
  // The neighbours may sit in the decade below (9.1 → 10) or above.
  for (const scale of [decade / 10, decade, decade * 10]) {
    for (const m of TABLES[series]) {
      const candidate = Number((m * scale).toPrecision(3));
      const distance = Math.abs(Math.log(candidate / ohms));
      if (distance < bestDistance) {
        bestDistance = distance;
        best = candidate;
      }
    }
  }
  return best;
}

import { normalizeSerial } from '../serial/normalize-serial';

/**
 * What a barcode scanner typed, turned into a batch of serials: each entry normalized by the
 * one serial rule (`normalizeSerial`: control characters such as a scanner's prefix/suffix
 * codes removed, surrounding blanks trimmed, upper case), blanks dropped, and a serial scanned
 * twice kept once at its first position.
 */
export interface ScanBatch {
  serials: string[];
  /** Serials that were scanned more than once, each listed once. */
  repeated: string[];
}

export function cleanScannedSerial(raw: string): string {
  return normalizeSerial(raw);
}

export function collectScanBatch(scans: readonly string[]): ScanBatch {
  const seen = new Set<string>();
  const repeated = new Set<string>();
  const serials: string[] = [];
  for (const raw of scans) {
    for (const piece of raw.split(/[\r\n\t,;]+/)) {
      const s = cleanScannedSerial(piece);
      if (!s) continue;
      if (seen.has(s)) {
        repeated.add(s);
        continue;
      }
      seen.add(s);
      serials.push(s);
    }
  }
  return { serials, repeated: [...repeated] };
}

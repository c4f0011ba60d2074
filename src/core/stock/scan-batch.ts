/**
 * What a barcode scanner typed, turned into a batch of serials: each entry trimmed, control
 * characters (a scanner's prefix/suffix codes) removed, blanks dropped, and a serial scanned
 * twice kept once at its first position. Serials compare case-sensitively, as stored.
 */
export interface ScanBatch {
  serials: string[];
  /** Serials that were scanned more than once, each listed once. */
  repeated: string[];
}

export function cleanScannedSerial(raw: string): string {
  // eslint-disable-next-line no-control-regex
  return raw.replace(/[\u0000-\u001f\u007f]/g, '').trim();
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

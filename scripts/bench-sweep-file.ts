/**
 * npm run bench:sweep-file — work per sweep file at the parser's bounds, no database.
 *
 * Times (median of several runs, in this process): reading hostile headers (100 000 gate-step
 * columns, 1.9 MB — refused by the column cap; 1000 columns of which 200 gate steps — the most
 * accepted, read in full), the byte check of a 4 MiB file, and parsing a 4 MiB long file of
 * 100 000 points (the point limit). Pure core code: what the worker spends before the fit.
 */
import { performance } from 'node:perf_hooks';
import { describeNonText, parseSweepFile, SweepFileError } from '~/core/sweep-file';
import { readSweepHeader } from '~/core/sweep-file/read-sweep-header';

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

function time(label: string, runs: number, fn: () => void) {
  const ms: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t = performance.now();
    fn();
    ms.push(performance.now() - t);
  }
  console.log(`${label.padEnd(64)} ${median(ms).toFixed(2).padStart(9)} ms (median of ${runs})`);
}

function refusal(fn: () => void): string {
  try {
    fn();
    return 'accepted';
  } catch (e) {
    if (e instanceof SweepFileError) return e.code;
    throw e;
  }
}

const hugeHeader = ['vds (V)', ...Array.from({ length: 100_000 }, (_, i) => `id_mA@vgs=-${(i / 10_000).toFixed(4)}`)].join(',');
const hugeFile = `${hugeHeader}\n0,${Array(100_000).fill('0').join(',')}\n`;
console.log(`100 000 gate-step header: ${(hugeFile.length / 1e6).toFixed(2)} MB → ${refusal(() => parseSweepFile({ text: hugeFile, fileName: 'h.csv', byteLength: hugeFile.length }))}`);
time('parse a file whose header has 100 000 gate-step columns', 5, () => refusal(() => parseSweepFile({ text: hugeFile, fileName: 'h.csv', byteLength: hugeFile.length })));

const wideCells = ['vds (V)', ...Array.from({ length: 200 }, (_, i) => `id_mA@vgs=-${(i / 100).toFixed(2)}`), ...Array.from({ length: 799 }, (_, i) => `note ${i}`)];
time('read a header of 1000 columns, 200 of them gate steps', 50, () => readSweepHeader(wideCells, { file: 'w.csv', line: 1, decimalComma: false }));

const rows = ['# serial: JX-1', 'vgs (V),vds (V),id (mA)'];
for (let s = 0; s < 10; s++) for (let k = 0; k < 10_000; k++) rows.push(`${(-0.2 * s).toFixed(1)},${(k * 0.001).toFixed(3)},${(5 - 0.4 * s + k * 1e-5).toFixed(6)}`);
const bigText = rows.join('\n') + '\n';
const bigBytes = new TextEncoder().encode(bigText);
console.log(`long file at the point limit: ${(bigBytes.length / 1024 / 1024).toFixed(2)} MiB, 100 000 points`);
time('byte check (binary, UTF-16, NUL, control bytes) of that file', 20, () => describeNonText(bigBytes));
time('parse that file (100 000 points, 10 gate steps)', 5, () => parseSweepFile({ text: bigText, fileName: 'big.csv', byteLength: bigBytes.length }));

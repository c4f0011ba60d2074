import { storableErrorMessage } from '~/core/text/storable-text';

/**
 * A logger for connection errors, which come in bursts (every pooled connection and every
 * poll of a fetch loop while the database is down): the first one in each `windowMs` is
 * logged with its stack, the rest are counted and summed up in the next line. Used by the
 * pool here and by pg-boss (src/lib/server/jobs/boss.ts).
 */
export function throttledErrorLog(prefix: string, windowMs = 10_000): (err: unknown) => void {
  let windowStart = 0;
  let suppressed = 0;
  return (err) => {
    const now = Date.now();
    if (now - windowStart < windowMs) {
      suppressed++;
      return;
    }
    const more = suppressed ? ` (${suppressed} more like it in the last ${Math.round((now - windowStart) / 1000)} s)` : '';
    windowStart = now;
    suppressed = 0;
    const stack = err instanceof Error && err.stack ? `\n${storableErrorMessage(err.stack, 4000)}` : '';
    console.error(`${prefix} ${storableErrorMessage(err)}${more}${stack}`);
  };
}

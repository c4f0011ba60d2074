import { describe, expect, it } from 'vitest';
import { unknownLotOf, uppyVerdict } from '~/core/intake/upload-verdict';

// Issue 13, item 2: the upload widget tells the truth. Only a fitted file may show as done
// (Uppy's green tick); a rejected one is an error with the server's reason.
describe('uppyVerdict', () => {
  it.each([
    ['queued', null, 'working'],
    ['fitted', null, 'done'],
    ['needs_review', 'fit RMS 4 % of IDSS', 'held'],
    ['rejected', 'a.csv: lot "L-9" (part X) is not known.', 'error'],
  ] as const)('%s → %s', (state, reason, kind) => {
    expect(uppyVerdict({ state, reason }).kind).toBe(kind);
  });
  it('a rejected file carries the reason, never a done state', () => {
    const v = uppyVerdict({ state: 'rejected', reason: 'line 4, column 2: expected a number' });
    expect(v).toEqual({ kind: 'error', message: 'Rejected: line 4, column 2: expected a number' });
    expect(v.kind).not.toBe('done');
  });
});

describe('unknownLotOf', () => {
  it('reads the lot code of an unknown-lot refusal (the intake message quotes it)', () => {
    const f = { state: 'rejected' as const, error_code: 'unknown_lot', reason: 'a.csv: lot "WS-N30-2701A" (part N-1) is not known. An inspector creates it first.' };
    expect(unknownLotOf(f)).toBe('WS-N30-2701A');
  });
  it('is null for other refusals and other states', () => {
    expect(unknownLotOf({ state: 'rejected', error_code: 'not_fittable', reason: 'lot "X"' })).toBeNull();
    expect(unknownLotOf({ state: 'fitted', error_code: null, reason: null })).toBeNull();
  });
});

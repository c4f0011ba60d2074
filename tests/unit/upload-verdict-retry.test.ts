import { describe, expect, it } from 'vitest';
import { retryWords, uppyVerdict } from '~/core/intake/upload-verdict';

// Derived: the words are ours; the numbers come from pg-boss's retry count (attempt n of
// retry limit + 1).
describe('a queued file that is being tried again', () => {
  it('says which attempt it is on', () => {
    expect(retryWords({ attempt: 2, attempts: 5 })).toBe('retrying, attempt 2 of 5');
    expect(uppyVerdict({ state: 'queued', reason: null, retry: { attempt: 3, attempts: 5 } })).toEqual({
      kind: 'working',
      message: 'Fitting on the server… retrying, attempt 3 of 5',
    });
  });

  it('a file on its first attempt reads as before', () => {
    expect(uppyVerdict({ state: 'queued', reason: null, retry: null })).toEqual({ kind: 'working', message: 'Fitting on the server…' });
    expect(uppyVerdict({ state: 'queued', reason: null })).toEqual({ kind: 'working', message: 'Fitting on the server…' });
  });
});

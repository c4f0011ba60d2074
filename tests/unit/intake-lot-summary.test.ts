import { describe, expect, it } from 'vitest';
import { lotSummaryText, summarizeUploadByLot, type SummaryFileInput } from '~/core/intake/summarize-upload-by-lot';

// Derived (issue 13, inspector): every file of an upload is counted once, under its lot,
// as fitted, flagged or refused; refusals are grouped by reason with one example each.
const f = (name: string, state: SummaryFileInput['state'], lot: string | null, extra: Partial<SummaryFileInput> = {}): SummaryFileInput => ({
  name,
  state,
  lot,
  errorCode: null,
  reason: null,
  parts: state === 'rejected' ? 0 : 1,
  ...extra,
});

describe('summarizeUploadByLot', () => {
  const files = [
    f('a.csv', 'fitted', 'L-10', { parts: 3 }),
    f('b.csv', 'fitted', 'L-10'),
    f('c.csv', 'needs_review', 'L-10'),
    f('d.csv', 'rejected', 'L-10', { errorCode: 'non_numeric', reason: 'd.csv line 7, column 3: "x" is not a number' }),
    f('e.csv', 'rejected', 'L-10', { errorCode: 'non_numeric', reason: 'e.csv line 2: …' }),
    f('g.csv', 'rejected', 'L-10', { errorCode: 'too_few_curves', reason: 'g.csv: 2 gate steps' }),
    f('h.csv', 'fitted', 'L-9'),
    f('z.csv', 'rejected', null, { errorCode: 'no_header', reason: 'z.csv: no header' }),
  ];
  const out = summarizeUploadByLot(files);

  it('one entry per lot, named lots first in natural order, the unknown lot last', () => {
    expect(out.map((s) => s.lot)).toEqual(['L-9', 'L-10', null]);
  });

  it('counts each file once and sums the parts of fitted and flagged files', () => {
    const l10 = out.find((s) => s.lot === 'L-10')!;
    expect(l10).toMatchObject({ files: 6, fitted: 2, needs_review: 1, rejected: 3, queued: 0, parts: { fitted: 4, needs_review: 1 } });
    expect(out.reduce((n, s) => n + s.files, 0)).toBe(files.length);
  });

  it('groups refusals by reason, biggest group first, with words and an example', () => {
    const l10 = out.find((s) => s.lot === 'L-10')!;
    expect(l10.refusals).toEqual([
      { code: 'non_numeric', words: 'a value is not a number', files: 2, example: 'd.csv line 7, column 3: "x" is not a number' },
      { code: 'too_few_curves', words: 'too few gate steps', files: 1, example: 'g.csv: 2 gate steps' },
    ]);
  });

  it('writes a plain mail text with every count', () => {
    const text = lotSummaryText(out.find((s) => s.lot === 'L-10')!, { deviceType: 'WS-N30', uploadedAt: '2 Dec 2026 08:00', uploadedBy: 'Ines', sender: 'Ines', link: 'http://x/upload/1/summary' });
    expect(text).toContain('lot L-10 (WS-N30)');
    expect(text).toMatch(/Fitted and accepted:\s+2 files \(4 parts\)/);
    expect(text).toMatch(/Flagged for review:\s+1 file \(1 part\)/);
    expect(text).toMatch(/Refused:\s+3 files/);
    expect(text).toContain('- a value is not a number: 2 files');
  });
});

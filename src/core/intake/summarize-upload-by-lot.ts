/**
 * The per-lot summary of one upload an inspector reads (and may mail to the supplier): for
 * each lot, how many files and parts were fitted, flagged for review or refused, and the
 * refusals grouped by reason. Pure.
 */
export interface SummaryFileInput {
  name: string;
  state: 'queued' | 'fitted' | 'needs_review' | 'rejected';
  errorCode: string | null;
  reason: string | null;
  /** The lot the file's parts belong to, or the lot it was refused for; null when none is known. */
  lot: string | null;
  parts: number;
}

export interface RefusalGroup {
  code: string;
  words: string;
  files: number;
  /** One file's own message, as an example of the group. */
  example: string;
}

export interface LotSummary {
  lot: string | null;
  files: number;
  parts: { fitted: number; needs_review: number };
  fitted: number;
  needs_review: number;
  rejected: number;
  queued: number;
  refusals: RefusalGroup[];
}

const REFUSAL_WORDS: Record<string, string> = {
  unknown_lot: 'lot not known',
  unknown_device_type: 'device type not known',
  no_device_type: 'no device type given',
  channel_conflict: 'channel does not match the device type',
  not_fittable: 'curves could not be fitted',
  part_unavailable: 'part reserved or issued, not re-measured',
  type_conflict: 'serial already known as another device type',
  stored_file_missing: 'stored file missing on the server',
  internal_error: 'server error while fitting',
  not_text: 'not a text file',
  too_large: 'file too large',
  empty_file: 'empty file',
  no_header: 'no header row',
  missing_column: 'a required column is missing',
  duplicate_column: 'a column appears twice',
  bad_header: 'header not understood',
  unknown_unit: 'unit not understood',
  ragged_row: 'rows of different lengths',
  empty_cell: 'empty cell',
  non_numeric: 'a value is not a number',
  not_finite: 'a value is not finite',
  bad_metadata: 'a # key: value line not understood',
  mixed_signs: 'mixed signs',
  duplicate_point: 'the same point twice',
  too_few_points: 'too few points per curve',
  too_few_curves: 'too few gate steps',
  implausible_value: 'implausible value',
  bad_serial: 'serial not usable',
};

export function refusalWords(code: string | null): string {
  if (!code) return 'refused';
  return REFUSAL_WORDS[code] ?? code.replace(/_/g, ' ');
}

export function summarizeUploadByLot(files: readonly SummaryFileInput[]): LotSummary[] {
  const byLot = new Map<string | null, LotSummary>();
  for (const f of files) {
    let s = byLot.get(f.lot);
    if (!s) {
      s = { lot: f.lot, files: 0, parts: { fitted: 0, needs_review: 0 }, fitted: 0, needs_review: 0, rejected: 0, queued: 0, refusals: [] };
      byLot.set(f.lot, s);
    }
    s.files++;
    s[f.state]++;
    if (f.state === 'fitted') s.parts.fitted += f.parts;
    if (f.state === 'needs_review') s.parts.needs_review += f.parts;
    if (f.state === 'rejected') {
      const code = f.errorCode ?? 'refused';
      const g = s.refusals.find((r) => r.code === code);
      if (g) g.files++;
      else s.refusals.push({ code, words: refusalWords(f.errorCode), files: 1, example: f.reason ?? f.name });
    }
  }
  for (const s of byLot.values()) s.refusals.sort((a, b) => b.files - a.files || a.code.localeCompare(b.code));
  // Named lots in code order, then files whose lot is not known.
  return [...byLot.values()].sort((a, b) => (a.lot === null ? 1 : b.lot === null ? -1 : a.lot.localeCompare(b.lot, 'en', { numeric: true })));
}

/** The mail text of one lot's summary: plain, so it reads the same in any mail program. */
export function lotSummaryText(s: LotSummary, ctx: { deviceType: string | null; uploadedAt: string; uploadedBy: string; sender: string; link: string }): string {
  const lines = [
    `Incoming inspection summary for lot ${s.lot ?? '(not known)'}${ctx.deviceType ? ` (${ctx.deviceType})` : ''}`,
    `Upload of ${ctx.uploadedAt} by ${ctx.uploadedBy}: ${s.files} file${s.files === 1 ? '' : 's'}.`,
    '',
    `  Fitted and accepted:  ${s.fitted} file${s.fitted === 1 ? '' : 's'} (${s.parts.fitted} part${s.parts.fitted === 1 ? '' : 's'})`,
    `  Flagged for review:   ${s.needs_review} file${s.needs_review === 1 ? '' : 's'} (${s.parts.needs_review} part${s.parts.needs_review === 1 ? '' : 's'})`,
    `  Refused:              ${s.rejected} file${s.rejected === 1 ? '' : 's'}`,
  ];
  if (s.queued) lines.push(`  Still being fitted:    ${s.queued} file${s.queued === 1 ? '' : 's'}`);
  if (s.refusals.length) {
    lines.push('', 'Refused, by reason:');
    for (const r of s.refusals) lines.push(`  - ${r.words}: ${r.files} file${r.files === 1 ? '' : 's'} (for example: ${r.example})`);
  }
  lines.push('', `Sent by ${ctx.sender} from Sluice.`, `Details (for our staff): ${ctx.link}`, '');
  return lines.join('\n');
}

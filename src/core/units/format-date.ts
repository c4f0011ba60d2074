/**
 * The one date format of Sluice: ISO 8601 calendar dates and 24-hour times in UTC, so a page,
 * a CSV, a label and a mail written at different places read alike ("2026-12-02",
 * "2026-12-02 07:46 UTC").
 */

function toDate(when: Date | string | number | null | undefined): Date | null {
  if (when === null || when === undefined || when === '') return null;
  const d = when instanceof Date ? when : new Date(when);
  return Number.isNaN(d.getTime()) ? null : d;
}

/** "2026-12-02"; "—" for a missing or unreadable date. */
export function formatDate(when: Date | string | number | null | undefined): string {
  const d = toDate(when);
  return d ? d.toISOString().slice(0, 10) : '—';
}

/** "2026-12-02 07:46 UTC"; "—" for a missing or unreadable date. */
export function formatDateTime(when: Date | string | number | null | undefined): string {
  const d = toDate(when);
  return d ? `${d.toISOString().slice(0, 10)} ${d.toISOString().slice(11, 16)} UTC` : '—';
}

/** "07:46 UTC" */
export function formatTime(when: Date | string | number | null | undefined): string {
  const d = toDate(when);
  return d ? `${d.toISOString().slice(11, 16)} UTC` : '—';
}

import type { AuditEntryJson } from '~/contracts/audit';
import { formatDateTime } from '~/core/units/format-date';

/**
 * Audit rows in words: when, who, what, and each change "from → to". The stored JSON stays one
 * click away for the rare question the words do not answer.
 */
export default function AuditTrail({ entries, showSubject = false }: { entries: AuditEntryJson[]; showSubject?: boolean }) {
  if (entries.length === 0) return <p className="text-ink-faint">Nothing recorded yet.</p>;
  return (
    <ol className="divide-y divide-paper-line" aria-label="Audit trail">
      {entries.map((a) => (
        <li key={a.id} className="py-2 text-sm" data-testid="audit-entry">
          <div className="flex flex-wrap items-baseline gap-x-3 gap-y-0.5">
            <time className="whitespace-nowrap text-ink-soft tabular-nums" dateTime={a.at}>
              {formatDateTime(a.at)}
            </time>
            {showSubject && (
              <span className="font-mono text-xs">
                {a.subject_type === 'part' ? (
                  <a href={`/parts/${encodeURIComponent(a.subject_id)}`}>{a.subject_id}</a>
                ) : (
                  `${a.subject_type.replace(/_/g, ' ')} ${a.subject_id}`
                )}
              </span>
            )}
            <span className="font-semibold">{a.what}</span>
            <span className="text-ink-soft">by {a.actor}</span>
          </div>
          {a.changes.length > 0 && (
            <ul className="mt-0.5 flex flex-wrap gap-x-4 gap-y-0.5">
              {a.changes.map((c) => (
                <li key={c.field}>
                  <span className="text-ink-soft">{c.field}</span>{' '}
                  {c.from !== null && c.to !== null ? (
                    <>
                      {c.from} <span aria-label="to">→</span> <strong>{c.to}</strong>
                    </>
                  ) : c.to !== null ? (
                    <strong>{c.to}</strong>
                  ) : (
                    <>
                      <s>{c.from}</s> removed
                    </>
                  )}
                </li>
              ))}
            </ul>
          )}
          {a.reason && <p className="mt-0.5 italic text-ink-soft">{a.reason}</p>}
          <details className="mt-0.5 text-xs text-ink-faint">
            <summary className="cursor-pointer">stored record</summary>
            <pre className="whitespace-pre-wrap break-all font-mono">{JSON.stringify({ action: a.action, before: a.before, after: a.after }, null, 1)}</pre>
          </details>
        </li>
      ))}
    </ol>
  );
}

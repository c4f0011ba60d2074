import { useState } from 'react';
import { apiFetch } from '../ui/api-client';

interface Props {
  serial: string;
  fitId: number;
  status: string;
  /** [curve, point] pairs the inspector has chosen to leave out. */
  excluded: [number, number][];
  changed: boolean;
  onDone: () => void;
}

/** Accept, refit without the chosen points, or mark for retest; each names the fit looked at. */
export default function ReviewActions({ serial, fitId, status, excluded, changed, onDone }: Props) {
  const [note, setNote] = useState('');
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ kind: 'ok' | 'error'; text: string }>();
  const base = `/api/review/${encodeURIComponent(serial)}`;
  const open = status === 'needs_review';

  async function act(path: string, body: Record<string, unknown>, ok: string) {
    setBusy(true);
    setMessage(undefined);
    try {
      await apiFetch(`${base}/${path}`, { method: 'POST', json: { fit_id: fitId, ...(note.trim() ? { note: note.trim() } : {}), ...body } });
      setMessage({ kind: 'ok', text: ok });
      setNote('');
      onDone();
    } catch (e) {
      setMessage({ kind: 'error', text: (e as Error).message });
    } finally {
      setBusy(false);
    }
  }

  return (
    <section className="card" aria-labelledby="review-heading">
      <h2 id="review-heading" className="mb-2 text-lg">Review</h2>
      {!open && <p className="notice-info mb-3">This part is {status.replace('_', ' ')}; it is not waiting for review.</p>}
      <label className="field" htmlFor="review-note">Note (kept in the audit trail)</label>
      <textarea id="review-note" className="input mb-3" rows={2} value={note} onChange={(e) => setNote(e.target.value)} placeholder="What you saw and why you decided" />
      <div className="flex flex-wrap gap-2">
        <button type="button" className="btn-primary" disabled={busy || !open} onClick={() => void act('accept', {}, `${serial} accepted and binned.`)}>
          Accept fit
        </button>
        <button
          type="button"
          className="btn-quiet"
          disabled={busy || !changed}
          onClick={() => void act('refit', { excluded_points: excluded }, `${serial} refitted without ${excluded.length} point${excluded.length === 1 ? '' : 's'}.`)}
        >
          Refit without {excluded.length} point{excluded.length === 1 ? '' : 's'}
        </button>
        <button type="button" className="btn-danger" disabled={busy || !open} onClick={() => void act('retest', {}, `${serial} marked for retest.`)}>
          Mark for retest
        </button>
      </div>
      <p className="mt-2 text-xs text-ink-faint">Points the fitter left out itself (self-heating, breakdown) stay out of every refit.</p>
      {message && <p className={`${message.kind === 'ok' ? 'notice-info' : 'notice-error'} mt-3`} role="status">{message.text}</p>}
    </section>
  );
}

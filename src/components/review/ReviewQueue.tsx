import { useState } from 'react';
import { percent, q, when } from '../parts/figures';
import { flagWord } from '../parts/part-types';
import { apiFetch } from '../ui/api-client';
import type { FitsAccepted, ReviewQueueQuery } from '~/contracts/review';
import { useReviewQueue } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';
import TabStrip from '../ui/TabStrip';

/** Parts waiting for an inspector (or for a retest), oldest first, flags in plain words. */
export default function ReviewQueue() {
  const [status, setStatus] = useState<ReviewQueueQuery['status']>('needs_review');
  const { data, error, loading, reload } = useReviewQueue(status);
  const [chosen, setChosen] = useState<Set<string>>(new Set());
  const [note, setNote] = useState('');
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ ok: boolean; text: string }>();
  const canChoose = status === 'needs_review';
  const items = data?.items ?? [];
  const toggle = (serial: string) =>
    setChosen((c) => {
      const n = new Set(c);
      if (n.has(serial)) n.delete(serial);
      else n.add(serial);
      return n;
    });
  async function acceptChosen() {
    setBusy(true);
    setMessage(undefined);
    try {
      const parts = items.filter((it) => chosen.has(it.serial)).map((it) => ({ serial: it.serial, ...(it.fit_id ? { fit_id: it.fit_id } : {}) }));
      const out = await apiFetch<FitsAccepted>('/api/review/accept', { method: 'POST', json: { parts, ...(note.trim() ? { note: note.trim() } : {}) } });
      setMessage({ ok: true, text: `Accepted and binned ${out.accepted.length} part${out.accepted.length === 1 ? '' : 's'}: ${out.accepted.map((a) => a.serial).join(', ')}.` });
      setChosen(new Set());
      setNote('');
      reload();
    } catch (e) {
      setMessage({ ok: false, text: (e as Error).message });
    } finally {
      setBusy(false);
    }
  }
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-2">
        <TabStrip
          label="Which parts"
          tabs={[
            { id: 'needs_review', label: 'Waiting for review' },
            { id: 'retest', label: 'Marked for retest' },
            { id: 'model_disagrees', label: 'Model differs from measurements' },
          ]}
          selected={status}
          onSelect={(s) => (setStatus(s), setChosen(new Set()))}
        />
        {data && <span className="ml-2 text-sm text-ink-soft">{data.total} part{data.total === 1 ? '' : 's'}</span>}
      </div>
      {loading && !data && <Loading what="the review queue" />}
      {error && <ErrorNotice error={error} retry={reload} />}
      {data && data.items.length === 0 && (
        <Empty>
          {status === 'needs_review'
            ? 'Nothing is waiting for review: every fit so far was clean or has been decided.'
            : status === 'retest'
              ? 'No parts are waiting for a retest.'
              : 'No part’s fitted model differs from its measurements by more than the limit.'}
        </Empty>
      )}
      {canChoose && items.length > 0 && (
        <div className="card flex flex-wrap items-end gap-3 p-3">
          <label className="flex min-h-11 items-center gap-2 text-sm">
            <input
              type="checkbox"
              checked={chosen.size > 0 && chosen.size === items.length}
              onChange={(e) => setChosen(e.target.checked ? new Set(items.map((it) => it.serial)) : new Set())}
            />
            Choose all {items.length} shown
          </label>
          <div className="w-full min-w-0 sm:w-auto sm:flex-1">
            <label className="field" htmlFor="accept-note">Note for the audit trail (optional)</label>
            <input id="accept-note" className="input" value={note} onChange={(e) => setNote(e.target.value)} placeholder="e.g. looked at each curve; breakdown points only" />
          </div>
          <button type="button" className="btn-primary" disabled={busy || chosen.size === 0} onClick={() => void acceptChosen()}>
            Accept {chosen.size || ''} chosen part{chosen.size === 1 ? '' : 's'}
          </button>
        </div>
      )}
      {message && <p className={message.ok ? 'notice-info' : 'notice-error'} role={message.ok ? 'status' : 'alert'}>{message.text}</p>}
      {data && data.items.length > 0 && (
        <table className="table-plain bg-paper-raised" aria-label="Review queue">
          <thead>
            <tr>
              {canChoose && <th className="w-10"><span className="sr-only">Choose</span></th>}
              <th>Serial</th>
              <th className="hidden sm:table-cell">Type · lot</th>
              <th>Why it is here</th>
              <th className="text-right">IDSS</th>
              <th className="text-right">VP</th>
              <th className="hidden text-right sm:table-cell">RMS / IDSS</th>
              <th className="hidden sm:table-cell">Fitted</th>
            </tr>
          </thead>
          <tbody>
            {data.items.map((it) => (
              <tr key={it.serial} data-testid={`queue-${it.serial}`}>
                {canChoose && (
                  <td className="!p-0">
                    <label className="flex h-11 w-11 items-center justify-center">
                      <input type="checkbox" checked={chosen.has(it.serial)} onChange={() => toggle(it.serial)} aria-label={`Choose ${it.serial}`} />
                    </label>
                  </td>
                )}
                <td className="font-mono whitespace-nowrap">
                  <a href={status === 'needs_review' ? `/review/${encodeURIComponent(it.serial)}` : `/parts/${encodeURIComponent(it.serial)}`}>{it.serial}</a>
                </td>
                <td className="hidden sm:table-cell">
                  {it.device_type}
                  {it.lot ? <span className="text-ink-faint"> · {it.lot}</span> : null}
                </td>
                <td className="max-w-xl">
                  {it.flags.length === 0 && <span className="text-ink-soft">{it.review_note ?? 'clean fit; the part was already in stock or returned, so a person confirms it'}</span>}
                  {it.flags.map((f) => (
                    <div key={f.code}>
                      <span className="tag-review mr-1">{flagWord(f.code)}</span>
                      {/* On a phone the flag's name is enough here; the review page gives the whole message. */}
                      <span className="hidden text-xs text-ink-soft sm:inline">{f.message}</span>
                    </div>
                  ))}
                </td>
                <td className="num">{q(it.idss_a, 'A', 2)}</td>
                <td className="num">{q(it.vp_v, 'V', 2)}</td>
                <td className="num hidden sm:table-cell">{percent(it.rms_rel)}</td>
                <td className="hidden whitespace-nowrap text-xs sm:table-cell">{when(it.fitted_at)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}

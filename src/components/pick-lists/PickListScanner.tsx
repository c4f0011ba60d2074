import { useEffect, useRef, useState, type FormEvent } from 'react';
import type { PickListView, PickReturnResult, PickScanResult } from '~/contracts/pick-lists';
import { formatTime } from '~/core/units/format-date';
import { STATUS_TAG, dateTime, relativeTo, roleLabel } from '../match/figures';
import { ApiError, apiFetch } from '../ui/api-client';
import { usePickList } from '../api';
import { ErrorNotice, Loading } from '../ui/states';

type Feedback = { kind: 'ok' | 'refused' | 'done'; text: string };

function ReturnParts({ list, onDone }: { list: PickListView; onDone: (l: PickListView, text: string) => void }) {
  const issued = list.lines.filter((l) => l.part_status === 'issued');
  const [chosen, setChosen] = useState<string[]>([]);
  const [restock, setRestock] = useState(true);
  const [error, setError] = useState<string>();
  if (issued.length === 0) return null;
  async function submit(e: FormEvent) {
    e.preventDefault();
    setError(undefined);
    try {
      const out = await apiFetch<PickReturnResult>(`/api/pick-lists/${list.id}/returns`, {
        method: 'POST',
        json: { serials: chosen, restock },
      });
      setChosen([]);
      onDone(out.pick_list, `Took back ${out.returned.join(', ')}${restock ? ': back in stock at their locations' : ': marked returned'}.`);
    } catch (err) {
      setError((err as Error).message);
    }
  }
  return (
    <form className="card p-4 space-y-3" onSubmit={submit} aria-label="Take parts back">
      <h2 className="text-base">Take parts back</h2>
      <p className="text-sm text-ink-soft">When a designer hands issued parts back, tick them here.</p>
      <div className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
        {issued.map((l) => (
          <label key={l.serial} className="flex items-center gap-1.5">
            <input type="checkbox" checked={chosen.includes(l.serial)} onChange={(e) => setChosen(e.target.checked ? [...chosen, l.serial] : chosen.filter((s) => s !== l.serial))} />
            <span className="font-mono">{l.serial}</span>
          </label>
        ))}
      </div>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" checked={restock} onChange={(e) => setRestock(e.target.checked)} />
        Put straight back into stock at the location each was picked from (untick to hold them as returned, e.g. for re-measuring)
      </label>
      {error && <p className="notice-error">{error}</p>}
      <button className="btn-quiet" type="submit" disabled={chosen.length === 0}>
        Take back {chosen.length || ''} part{chosen.length === 1 ? '' : 's'}
      </button>
    </form>
  );
}

export default function PickListScanner({ id, canPick }: { id: string; canPick: boolean }) {
  const loaded = usePickList(id);
  const [list, setList] = useState<PickListView>();
  const [serial, setSerial] = useState('');
  const [feedback, setFeedback] = useState<Feedback>();
  const [busy, setBusy] = useState(false);
  const input = useRef<HTMLInputElement>(null);
  useEffect(() => {
    if (loaded.data) setList(loaded.data);
  }, [loaded.data]);

  // The next line in walking order; a scan of any other unpicked line's serial counts as well.
  const current = list?.lines.find((l) => !l.picked_at);
  const open = list?.status === 'open' && list.reservation.status === 'active';
  const keepFocus = () => {
    if (canPick && open) setTimeout(() => input.current?.focus(), 0);
  };
  // A disabled or re-rendered input loses focus; put it back whenever a scan finishes.
  useEffect(() => {
    if (!busy) keepFocus();
  }, [list, busy, canPick]);

  async function scan(e: FormEvent) {
    e.preventDefault();
    const s = serial.trim();
    if (!s || !current || busy) return;
    setBusy(true);
    try {
      const out = await apiFetch<PickScanResult>(`/api/pick-lists/${id}/scan`, { method: 'POST', json: { serial: s } });
      setList(out.pick_list);
      setFeedback(
        out.complete
          ? {
              kind: 'done',
              text: `Line ${out.line_no}: ${out.serial} picked. The list is complete: ${out.issued.length} parts issued to ${out.pick_list.reservation.designer_name}${out.mailed_to ? `, who has been e-mailed` : ''}.`,
            }
          : { kind: 'ok', text: `Line ${out.line_no}: ${out.serial} picked.` },
      );
    } catch (err) {
      setFeedback({ kind: 'refused', text: err instanceof ApiError ? err.message : `Not recorded: ${(err as Error).message}` });
    } finally {
      setSerial('');
      setBusy(false);
      keepFocus();
    }
  }

  if (loaded.loading && !list) return <Loading what="the pick list" />;
  if (loaded.error) return <ErrorNotice error={loaded.error} retry={loaded.reload} />;
  if (!list) return null;
  return (
    <div className="space-y-5">
      <header className="flex flex-wrap items-baseline gap-3">
        <h1>
          Pick list <span className="font-mono">{list.code}</span>
        </h1>
        <span className={STATUS_TAG[list.status] ?? 'tag-plain'}>{list.status}</span>
        <a className="btn-quiet no-underline hover:no-underline" href={`/pick-lists/${list.id}/print`} target="_blank" rel="noopener">
          Printable list
        </a>
        <span className="text-sm text-ink-soft">
          for {list.reservation.designer_name} · reservation <span className="font-mono">{list.reservation.code}</span>
          {list.reservation.purpose && ` · ${list.reservation.purpose}`}
          {list.reservation.status === 'active' && ` · expires ${relativeTo(list.reservation.expires_at)}`}
        </span>
      </header>
      <div className="flex items-center gap-3">
        <div className="h-2 flex-1 max-w-md rounded bg-paper-sunk overflow-hidden" aria-hidden="true">
          <div className="h-full bg-channel-500" style={{ width: `${(100 * list.lines_picked) / Math.max(1, list.lines_total)}%` }} />
        </div>
        <span className="text-sm" data-testid="pick-progress">
          {list.lines_picked} of {list.lines_total} picked
        </span>
      </div>

      {canPick && open && current && (
        <form onSubmit={scan} className="card p-4 grid gap-3 md:grid-cols-[1fr_auto] items-end" aria-label="Scan a serial">
          <div>
            <p className="text-sm mb-2">
              Next by location, line <strong>{current.line_no}</strong>: take <strong className="font-mono">{current.serial}</strong> from{' '}
              <strong>{current.location ?? 'no recorded location'}</strong>
              {current.location_barcode && <span className="text-ink-faint"> ({current.location_barcode})</span>} — set {current.set_no}, {roleLabel(current.role, current.cascode_index)}.
              <span className="block text-ink-soft">Parts can be scanned in any order: each serial ticks off its own line.</span>
            </p>
            <label className="field" htmlFor="scan-serial">Scan the part’s serial</label>
            <input
              id="scan-serial"
              ref={input}
              className="input font-mono text-lg"
              autoComplete="off"
              autoFocus
              value={serial}
              readOnly={busy}
              onChange={(e) => setSerial(e.target.value)}
              onBlur={(e) => {
                // Keep the scanner's keystrokes landing here, unless the person moved to another control.
                if (!e.relatedTarget) keepFocus();
              }}
            />
          </div>
          <button type="submit" className="btn-primary" disabled={busy || !serial.trim()}>
            Confirm part
          </button>
        </form>
      )}
      {feedback && (
        <p className={feedback.kind === 'refused' ? 'notice-error' : 'notice-info'} role={feedback.kind === 'refused' ? 'alert' : 'status'} data-testid="scan-feedback">
          {feedback.kind === 'refused' && <strong>Refused: </strong>}
          {feedback.text}
        </p>
      )}
      {list.status === 'cancelled' && <p className="notice-caution">This list was cancelled. Put any parts already taken for it back in their locations.</p>}
      {list.status === 'complete' && (
        <p className="notice-info">
          Complete {dateTime(list.completed_at)}
          {list.completed_by && ` by ${list.completed_by}`}: every part was issued to the reservation.
        </p>
      )}

      <div className="card p-0 overflow-x-auto">
        <table className="table-plain" aria-label="Lines">
          <thead>
            <tr>
              {/* On a phone the line number goes and the role joins the set, so "Picked" stays in view. */}
              <th className="num !text-right hidden sm:table-cell">Line</th>
              <th>Location</th>
              <th>Serial</th>
              <th>Set</th>
              <th className="hidden sm:table-cell">Role</th>
              <th>Picked</th>
            </tr>
          </thead>
          <tbody>
            {list.lines.map((l) => {
              const isCurrent = open && current?.line_no === l.line_no;
              return (
                <tr key={l.line_no} className={isCurrent ? 'bg-channel-50' : l.picked_at ? 'text-ink-faint' : ''} aria-current={isCurrent ? 'step' : undefined}>
                  <td className="num hidden sm:table-cell">{l.line_no}</td>
                  <td>
                    {l.location ?? '—'}
                    {l.location_barcode && <span className="text-xs text-ink-faint"> {l.location_barcode}</span>}
                  </td>
                  <td className="font-mono whitespace-nowrap">{l.serial}</td>
                  <td className="whitespace-nowrap">
                    {l.set_no}
                    <span className="sm:hidden"> · {roleLabel(l.role, l.cascode_index)}</span>
                  </td>
                  <td className="hidden sm:table-cell">{roleLabel(l.role, l.cascode_index)}</td>
                  <td>
                    {l.picked_at ? (
                      <div className="flex flex-col items-start gap-0.5 sm:flex-row sm:items-center sm:gap-1">
                        <span className="tag-ok whitespace-nowrap">
                          ✓ {formatTime(l.picked_at)}
                          {/* The picker's name on wider screens; a phone keeps the column narrow. */}
                          {l.picked_by && <span className="hidden sm:inline"> · {l.picked_by}</span>}
                        </span>
                        {(l.part_status === 'in_stock' || l.part_status === 'returned') && (
                          <span className="text-xs text-ink-soft sm:whitespace-nowrap">
                            taken back{l.part_status === 'in_stock' ? ', in stock' : ', held as returned'}
                          </span>
                        )}
                      </div>
                    ) : (
                      <span className="text-ink-faint">waiting</span>
                    )}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      {canPick && list.status === 'complete' && <ReturnParts list={list} onDone={(l, text) => (setList(l), setFeedback({ kind: 'ok', text }))} />}
    </div>
  );
}

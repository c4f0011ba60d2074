import { useEffect, useRef, useState, type FormEvent, type KeyboardEvent } from 'react';
import { collectScanBatch } from '~/core/stock/scan-batch';
import { formatQuantity } from '~/core/units/format-quantity';
import type { PartLookup, StockActionResult } from '~/contracts/stock';
import { ApiError, apiFetch } from '../ui/api-client';

export type StockAction = StockActionResult['action'];

interface Row {
  serial: string;
  state: 'checking' | 'ready' | 'problem' | 'done';
  note: string;
  lookup?: PartLookup;
}

const VERB: Record<StockAction, { button: string; done: string; cannot: (l: PartLookup) => string }> = {
  receive: {
    button: 'Receive',
    done: 'received',
    cannot: (l) => (l.status === 'accepted' || l.status === 'returned' ? 'no bin in the active plan yet' : `it is ${l.status_words}; only accepted parts are received`),
  },
  move: { button: 'Move', done: 'moved', cannot: (l) => `it is ${l.status_words}; only parts in stock are moved` },
  return: { button: 'Take back', done: 'returned', cannot: (l) => `it is ${l.status_words}; only issued parts are returned` },
  scrap: { button: 'Scrap', done: 'scrapped', cannot: (l) => `it is ${l.status_words} and cannot be scrapped` },
};

function readyNote(action: StockAction, l: PartLookup): string {
  const figures = l.idss_a !== null && l.vp_v !== null ? ` · IDSS ${formatQuantity(l.idss_a, 'A', 2)}, VP ${formatQuantity(l.vp_v, 'V', 2)}` : '';
  if (action === 'receive') return `${l.device_type} · bin ${l.bin_code ?? '—'} → ${l.home_location ?? 'no home location set'}${figures}`;
  return `${l.device_type} · bin ${l.bin_code ?? '—'} · now at ${l.location ?? '—'}`;
}

/**
 * A scan box for a USB barcode scanner (it types the serial and Enter). The box keeps focus,
 * each serial is looked up as it arrives, and the batch goes to the server as one request.
 */
export default function ScanBatch({ action, onDone }: { action: StockAction; onDone?: () => void }) {
  const [rows, setRows] = useState<Row[]>([]);
  const [text, setText] = useState('');
  const [flash, setFlash] = useState<string>();
  const [busy, setBusy] = useState(false);
  const [result, setResult] = useState<{ ok: boolean; text: string; alerts?: StockActionResult['low_stock_alerts'] }>();
  const [location, setLocation] = useState('');
  const [reason, setReason] = useState('');
  const [restock, setRestock] = useState(true);
  const input = useRef<HTMLInputElement>(null);
  const focusScan = () => {
    requestAnimationFrame(() => input.current?.focus());
  };
  useEffect(() => {
    focusScan();
  }, [action]);

  async function check(serial: string) {
    try {
      const l = await apiFetch<PartLookup>(`/api/stock/lookup?serial=${encodeURIComponent(serial)}`);
      setRows((rs) => rs.map((r) => (r.serial === serial ? { ...r, lookup: l, state: l.can[action] ? 'ready' : 'problem', note: l.can[action] ? readyNote(action, l) : VERB[action].cannot(l) } : r)));
    } catch (e) {
      setRows((rs) => rs.map((r) => (r.serial === serial ? { ...r, state: 'problem', note: (e as Error).message } : r)));
    }
  }

  function add(raw: string) {
    const { serials } = collectScanBatch([raw]);
    const have = new Set(rows.map((r) => r.serial));
    const fresh = serials.filter((s) => !have.has(s));
    const repeats = serials.filter((s) => have.has(s));
    setFlash(repeats.length ? `${repeats.join(', ')} already in this batch.` : undefined);
    if (fresh.length === 0) return;
    setResult(undefined);
    setRows((rs) => [...fresh.map((s) => ({ serial: s, state: 'checking' as const, note: 'looking up…' })), ...rs.filter((r) => r.state !== 'done')]);
    for (const s of fresh) void check(s);
  }

  function onKey(e: KeyboardEvent<HTMLInputElement>) {
    if (e.key === 'Enter') {
      e.preventDefault();
      add(text);
      setText('');
    }
  }

  const ready = rows.filter((r) => r.state === 'ready');
  const blocked = rows.filter((r) => r.state === 'problem' || r.state === 'checking');

  async function submit(e: FormEvent) {
    e.preventDefault();
    if (!ready.length) return;
    setBusy(true);
    const serials = ready.map((r) => r.serial);
    const body: Record<string, unknown> = { serials };
    if ((action === 'move' || action === 'receive' || (action === 'return' && restock)) && location.trim()) body.location_barcode = location.trim();
    if (reason.trim()) body.reason = reason.trim();
    if (action === 'return') body.restock = restock;
    try {
      const res = await apiFetch<StockActionResult>(`/api/stock/${action}`, { method: 'POST', json: body });
      const by = new Map(res.parts.map((p) => [p.serial, p]));
      setRows((rs) =>
        rs.map((r) => {
          const p = by.get(r.serial);
          return p ? { ...r, state: 'done', note: `${VERB[action].done}${p.bin_code ? ` · bin ${p.bin_code}` : ''}${p.location ? ` · ${p.location}` : ''}` } : r;
        }),
      );
      setResult({ ok: true, text: `${res.count} part${res.count === 1 ? '' : 's'} ${VERB[action].done} in one batch.`, alerts: res.low_stock_alerts });
      if (action === 'scrap') setReason('');
      onDone?.();
    } catch (err) {
      const refused = err instanceof ApiError ? ((err.body?.error.refused as { serial: string; reason: string }[] | undefined) ?? []) : [];
      const unknown = err instanceof ApiError ? ((err.body?.error.unknown as string[] | undefined) ?? []) : [];
      if (refused.length || unknown.length) {
        const why = new Map(refused.map((r) => [r.serial, r.reason]));
        setRows((rs) => rs.map((r) => (why.has(r.serial) ? { ...r, state: 'problem', note: why.get(r.serial)! } : unknown.includes(r.serial) ? { ...r, state: 'problem', note: 'not known' } : r)));
      }
      setResult({ ok: false, text: (err as Error).message });
    } finally {
      setBusy(false);
      focusScan();
    }
  }

  return (
    <form onSubmit={submit} className="space-y-4" aria-label={`${VERB[action].button} by scanning`}>
      <div className="grid gap-4 md:grid-cols-[1fr_18rem]">
        <div>
          <label className="field" htmlFor={`scan-${action}`}>Scan serials (or type one and press Enter)</label>
          <input
            id={`scan-${action}`}
            ref={input}
            className="input font-mono text-lg"
            value={text}
            autoComplete="off"
            spellCheck={false}
            placeholder="serial ⏎"
            onChange={(e) => setText(e.target.value)}
            onKeyDown={onKey}
            onBlur={(e) => {
              const next = e.relatedTarget as HTMLElement | null;
              if (!next || !['INPUT', 'SELECT', 'TEXTAREA', 'BUTTON', 'A'].includes(next.tagName)) focusScan();
            }}
            data-testid="scan-input"
          />
          {flash && <p className="text-sm text-state-review mt-1" role="status">{flash}</p>}
        </div>
        {action === 'scrap' && (
          <div>
            <label className="field" htmlFor="scrap-reason">Reason (required)</label>
            <input id="scrap-reason" className="input" value={reason} onChange={(e) => setReason(e.target.value)} placeholder="e.g. gate leakage after ESD event" />
          </div>
        )}
        {(action === 'move' || action === 'receive') && (
          <div>
            <label className="field" htmlFor={`loc-${action}`}>{action === 'move' ? 'Scan the location it goes to' : 'Location (blank: each bin’s home)'}</label>
            <input id={`loc-${action}`} className="input font-mono" value={location} onChange={(e) => setLocation(e.target.value)} placeholder={action === 'move' ? 'blank: back to home location' : 'location barcode'} />
          </div>
        )}
        {action === 'return' && (
          <div className="space-y-2">
            <label className="flex items-center gap-2 text-sm"><input type="checkbox" checked={restock} onChange={(e) => setRestock(e.target.checked)} /> Put straight back in stock (home location)</label>
            <input aria-label="Reason for the return" className="input" value={reason} onChange={(e) => setReason(e.target.value)} placeholder="reason (optional)" />
          </div>
        )}
      </div>
      {rows.length > 0 && (
        <table className="table-plain bg-paper-raised" data-testid={`batch-${action}`}>
          <thead>
            <tr><th className="sm:w-44">Serial</th><th className="w-24">Result</th><th>Detail</th><th className="w-10"></th></tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.serial} data-serial={r.serial} data-state={r.state}>
                <td className="font-mono whitespace-nowrap">{r.serial}</td>
                <td>
                  {r.state === 'checking' && <span className="tag-plain">checking</span>}
                  {r.state === 'ready' && <span className="tag-ok">ready</span>}
                  {r.state === 'problem' && <span className="tag-fault">cannot</span>}
                  {r.state === 'done' && <span className="tag-held">{VERB[action].done}</span>}
                </td>
                <td className="min-w-[12rem] text-ink-soft">{r.note}</td>
                <td>
                  {r.state !== 'done' && (
                    <button type="button" className="min-h-11 min-w-11 text-ink-faint hover:text-state-fault md:min-h-0 md:min-w-0" aria-label={`Remove ${r.serial}`} onClick={() => (setRows((rs) => rs.filter((x) => x.serial !== r.serial)), focusScan())}>×</button>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <div className="flex flex-wrap items-center gap-3">
        <button className={action === 'scrap' ? 'btn-danger' : 'btn-primary'} type="submit" disabled={busy || ready.length === 0 || (action === 'scrap' && reason.trim().length < 3)}>
          {VERB[action].button} {ready.length} part{ready.length === 1 ? '' : 's'}
        </button>
        {blocked.length > 0 && <span className="text-sm text-ink-soft">{blocked.length} not in the batch (see each line).</span>}
        {rows.some((r) => r.state === 'done') && (
          <button type="button" className="btn-quiet" onClick={() => (setRows((rs) => rs.filter((r) => r.state !== 'done')), setResult(undefined), focusScan())}>Clear finished</button>
        )}
      </div>
      {result && (
        <div className={result.ok ? 'notice-info' : 'notice-error'} role={result.ok ? 'status' : 'alert'}>
          <p>{result.text}</p>
          {result.alerts?.map((a) => (
            <p key={a.bin_code} className="mt-1">Low stock: bin {a.bin_code} of {a.device_type} now has {a.on_hand} on hand (threshold {a.threshold}); stores were e-mailed.</p>
          ))}
        </div>
      )}
    </form>
  );
}

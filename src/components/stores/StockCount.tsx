import { useEffect, useRef, useState, type KeyboardEvent } from 'react';
import type { StockCountJson, StockCountPart } from '~/contracts/stock';
import { collectScanBatch } from '~/core/stock/scan-batch';
import { apiFetch } from '../ui/api-client';

function Group({ title, hint, tone, testId, children, count }: { title: string; hint: string; tone: string; testId: string; count: number; children: React.ReactNode }) {
  return (
    <section className="card p-4" aria-label={title} data-testid={testId}>
      <h3 className="text-base flex items-baseline gap-2">
        <span className={tone}>{count}</span> {title}
      </h3>
      <p className="text-xs text-ink-soft mb-2">{hint}</p>
      {count > 0 && <ul className="space-y-1 text-sm">{children}</ul>}
    </section>
  );
}

function PartLine({ p, what }: { p: StockCountPart; what: string }) {
  return (
    <li data-serial={p.serial}>
      <a className="font-mono" href={`/parts/${encodeURIComponent(p.serial)}`}>{p.serial}</a> <span className="text-ink-soft">{what}</span>
    </li>
  );
}

/**
 * Stock-count mode for one location: scan the location's label, then every part in it. The
 * screen compares as you scan (found, missing, misplaced, should not be here, unknown) and
 * corrects the records in one transaction when asked.
 */
export default function StockCount() {
  const [barcode, setBarcode] = useState('');
  const [locationText, setLocationText] = useState('');
  const [serials, setSerials] = useState<string[]>([]);
  const [text, setText] = useState('');
  const [count, setCount] = useState<StockCountJson>();
  const [error, setError] = useState<string>();
  const [holdMissing, setHoldMissing] = useState(true);
  const [showFound, setShowFound] = useState(false);
  const [busy, setBusy] = useState(false);
  const scanRef = useRef<HTMLInputElement>(null);
  const locRef = useRef<HTMLInputElement>(null);
  const focus = () => requestAnimationFrame(() => (barcode ? scanRef.current : locRef.current)?.focus());
  useEffect(() => {
    focus();
  }, [barcode]);

  async function compare(loc: string, list: string[], apply = false) {
    setBusy(true);
    try {
      const out = await apiFetch<StockCountJson>('/api/stores/count', { method: 'POST', json: { location_barcode: loc, serials: list, apply, hold_missing: holdMissing } });
      setCount(out);
      setError(undefined);
      return out;
    } catch (e) {
      setError((e as Error).message);
      return undefined;
    } finally {
      setBusy(false);
      focus();
    }
  }

  async function onLocationKey(e: KeyboardEvent<HTMLInputElement>) {
    if (e.key !== 'Enter') return;
    e.preventDefault();
    // A location barcode is matched as printed (the serial rule's upper-casing is for serials only).
    const loc = locationText.trim();
    if (!loc) return;
    const out = await compare(loc, []);
    if (out) {
      setBarcode(loc);
      setSerials([]);
    }
  }

  function onSerialKey(e: KeyboardEvent<HTMLInputElement>) {
    if (e.key !== 'Enter') return;
    e.preventDefault();
    const fresh = collectScanBatch([text]).serials.filter((s) => !serials.includes(s));
    setText('');
    if (!fresh.length || count?.applied) return;
    const next = [...serials, ...fresh];
    setSerials(next);
    void compare(barcode, next);
  }

  function remove(serial: string) {
    const next = serials.filter((s) => s !== serial);
    setSerials(next);
    void compare(barcode, next);
  }

  function restart() {
    setBarcode('');
    setLocationText('');
    setSerials([]);
    setCount(undefined);
    setError(undefined);
  }

  const differences = count ? count.missing.length + count.misplaced.length : 0;
  const done = Boolean(count?.applied);

  return (
    <div className="space-y-5">
      <div className="card grid gap-4 md:grid-cols-2">
        <div>
          <label className="field" htmlFor="count-location">1. Scan the location’s label</label>
          {barcode && count ? (
            <div className="flex flex-wrap items-center gap-3">
              <p className="text-lg font-semibold" data-testid="count-location-name">
                {count.location.name} <span className="font-mono text-sm text-ink-soft">{count.location.barcode}</span>
              </p>
              <button type="button" className="btn-quiet" onClick={restart}>Count another location</button>
            </div>
          ) : (
            <input
              id="count-location"
              ref={locRef}
              className="input font-mono text-lg"
              autoComplete="off"
              spellCheck={false}
              placeholder="location barcode ⏎"
              value={locationText}
              onChange={(e) => setLocationText(e.target.value)}
              onKeyDown={(e) => void onLocationKey(e)}
            />
          )}
        </div>
        <div>
          <label className="field" htmlFor="count-serial">2. Scan every part in it</label>
          <input
            id="count-serial"
            ref={scanRef}
            className="input font-mono text-lg"
            autoComplete="off"
            spellCheck={false}
            placeholder={barcode ? 'serial ⏎' : 'scan the location first'}
            disabled={!barcode || done}
            value={text}
            onChange={(e) => setText(e.target.value)}
            onKeyDown={onSerialKey}
            data-testid="count-scan"
          />
          {count && <p className="mt-1 text-sm text-ink-soft" role="status" data-testid="count-progress">{serials.length} scanned · {count.found.length} of {count.recorded} recorded here found{busy ? ' · checking…' : ''}</p>}
        </div>
      </div>
      {error && <p className="notice-error" role="alert">{error}</p>}

      {count && (
        <>
          <div className="grid gap-4 md:grid-cols-2 xl:grid-cols-3">
            <Group title="missing" hint="Recorded here but not scanned. Look again, or correct: in-stock parts go on hold (quarantined) so nobody reserves them." tone="tag-fault" testId="count-missing" count={count.missing.length}>
              {count.missing.map((p) => <PartLine key={p.serial} p={p} what={p.status === 'reserved' ? '· reserved: left as it is; tell whoever holds the reservation' : '· in stock by the records'} />)}
            </Group>
            <Group title="misplaced" hint="On the shelf by the records, but at another location. Correcting records them here." tone="tag-review" testId="count-misplaced" count={count.misplaced.length}>
              {count.misplaced.map((p) => <PartLine key={p.serial} p={p} what={`· recorded at ${p.recorded_at ?? 'no location'} (${p.status_words})`} />)}
            </Group>
            <Group title="should not be here" hint="Not on the shelf by the records. Take them out and deal with them at the Receive & move desk." tone="tag-held" testId="count-unexpected" count={count.unexpected.length}>
              {count.unexpected.map((p) => <PartLine key={p.serial} p={p} what={`· ${p.status_words}`} />)}
            </Group>
            <Group title="unknown serials" hint="No part has these serials: check the label." tone="tag-plain" testId="count-unknown" count={count.unknown.length}>
              {count.unknown.map((s) => (
                <li key={s} className="flex items-center justify-between gap-2">
                  <span className="font-mono">{s}</span>
                  {!done && <button type="button" className="btn-quiet min-w-11 justify-center py-0" aria-label={`Unscan ${s}`} onClick={() => remove(s)}>×</button>}
                </li>
              ))}
            </Group>
            <Group title="found where the records say" hint="Recorded here and scanned here." tone="tag-ok" testId="count-found" count={count.found.length}>
              {(count.found.length > 8 && !showFound ? count.found.slice(-3) : count.found).map((s) => (
                <li key={s} className="flex items-center justify-between gap-2" data-serial={s}>
                  <span className="font-mono">{s}</span>
                  {!done && <button type="button" className="btn-quiet min-w-11 justify-center py-0" aria-label={`Unscan ${s}`} onClick={() => remove(s)}>×</button>}
                </li>
              ))}
              {count.found.length > 8 && (
                <li>
                  <button type="button" className="btn-quiet" onClick={() => setShowFound((v) => !v)}>
                    {showFound ? 'Show only the last 3' : `Show all ${count.found.length}`}
                  </button>
                </li>
              )}
            </Group>
          </div>

          {!done ? (
            <div className="card flex flex-wrap items-center gap-4">
              <label className="flex min-h-11 items-center gap-2 text-sm">
                <input type="checkbox" checked={holdMissing} onChange={(e) => setHoldMissing(e.target.checked)} /> Put missing in-stock parts on hold (quarantined)
              </label>
              <button type="button" className="btn-primary" disabled={busy || differences === 0} onClick={() => void compare(barcode, serials, true)}>
                {differences === 0 ? 'Nothing to correct' : `Correct ${differences} record${differences === 1 ? '' : 's'} in one go`}
              </button>
              <span className="text-sm text-ink-soft">Every change is kept in the audit log with your name.</span>
            </div>
          ) : (
            <div className="notice-info" role="status" data-testid="count-applied">
              <p className="font-semibold">Count of {count.location.name} recorded.</p>
              <p>
                {count.applied!.moved_here.length} moved here{count.applied!.moved_here.length ? ` (${count.applied!.moved_here.join(', ')})` : ''} ·{' '}
                {count.applied!.held.length} put on hold{count.applied!.held.length ? ` (${count.applied!.held.join(', ')})` : ''}
                {count.applied!.left_reserved.length > 0 && ` · reserved and missing, left as they are: ${count.applied!.left_reserved.join(', ')}`}
              </p>
              {count.low_stock_alerts.map((a) => (
                <p key={a.bin_code}>Low stock: bin {a.bin_code} of {a.device_type} now has {a.on_hand} on hand (threshold {a.threshold}); stores were e-mailed.</p>
              ))}
            </div>
          )}
        </>
      )}
    </div>
  );
}

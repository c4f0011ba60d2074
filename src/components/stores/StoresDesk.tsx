import { useState } from 'react';
import { apiFetch } from '../ui/api-client';
import type { AwaitingLot, StockActionResult } from '~/contracts/stock';
import { useAwaitingReceipt } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';
import ScanBatch, { type StockAction } from './ScanBatch';
import TabStrip from '../ui/TabStrip';

const TABS: { id: StockAction; label: string; hint: string }[] = [
  { id: 'receive', label: 'Receive', hint: 'Accepted parts go on the shelf at their bin’s home location.' },
  { id: 'move', label: 'Move', hint: 'Parts in stock go to another location, or back home.' },
  { id: 'return', label: 'Return', hint: 'Issued parts come back; put them straight back in stock or keep them aside for a look.' },
  { id: 'scrap', label: 'Scrap', hint: 'Parts are scrapped for good, with the reason kept in the audit log.' },
];

function AwaitingLots({ onReceived }: { onReceived: () => void }) {
  const { data, error, loading, reload } = useAwaitingReceipt();
  const [message, setMessage] = useState<{ ok: boolean; text: string }>();
  async function receiveLot(l: AwaitingLot) {
    try {
      const r = await apiFetch<StockActionResult>('/api/stock/receive', { method: 'POST', json: { lot: l.lot_id } });
      setMessage({ ok: true, text: `Lot ${l.lot}: ${r.count} parts received.` });
      reload();
      onReceived();
    } catch (e) {
      setMessage({ ok: false, text: (e as Error).message });
    }
  }
  return (
    <section className="card space-y-3" aria-label="Accepted parts waiting">
      <h2 className="text-lg">Waiting to be received</h2>
      {loading && !data && <Loading what="waiting lots" />}
      {error && <ErrorNotice error={error} retry={reload} />}
      {data && data.lots.length === 0 && <Empty>Nothing is waiting: every accepted part is in stock.</Empty>}
      {data && data.lots.length > 0 && (
        <table className="table-plain">
          <thead><tr><th>Type</th><th>Lot</th><th className="text-right">Accepted</th><th></th></tr></thead>
          <tbody>
            {data.lots.map((l) => (
              <tr key={`${l.device_type}-${l.lot_id}`}>
                <td className="whitespace-nowrap">{l.device_type}</td>
                <td className="whitespace-nowrap">{l.lot ?? <span className="text-ink-faint">no lot</span>}</td>
                <td className="num">{l.accepted}{l.unbinned > 0 && <span className="tag-review ml-1" title="no bin yet">{l.unbinned} unbinned</span>}</td>
                <td className="text-right">
                  {l.lot_id !== null && (
                    <button type="button" className="btn-quiet whitespace-nowrap py-0.5" disabled={l.unbinned === l.accepted} onClick={() => void receiveLot(l)} aria-label={`Receive all of lot ${l.lot}`}>Receive lot</button>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {message && <p className={message.ok ? 'notice-info' : 'notice-error'} role="status">{message.text}</p>}
    </section>
  );
}

export default function StoresDesk({ allowed }: { allowed: StockAction[] }) {
  const tabs = TABS.filter((t) => allowed.includes(t.id));
  const [tab, setTab] = useState<StockAction>(tabs[0]?.id ?? 'receive');
  const [tick, setTick] = useState(0);
  if (tabs.length === 0) return <Empty>Your roles allow no stock actions.</Empty>;
  const current = tabs.find((t) => t.id === tab)!;
  return (
    <div className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_24rem]">
      <div className="card">
        <TabStrip label="Stock action" look="folder" className="mb-4" tabs={tabs} selected={tab} onSelect={setTab} />
        <p className="text-sm text-ink-soft mb-3">{current.hint}</p>
        <ScanBatch key={tab} action={tab} onDone={() => setTick((n) => n + 1)} />
      </div>
      {allowed.includes('receive') && <AwaitingLots key={tick} onReceived={() => undefined} />}
    </div>
  );
}

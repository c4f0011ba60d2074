import { useState, type FormEvent } from 'react';
import { when } from './figures';
import { STATUS_WORDS, statusClass } from './part-types';
import { apiFetch } from '../ui/api-client';
import type { LotCreated } from '~/contracts/lots';
import { useLots } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';

/** Lots with their parts counted by status; inspectors may add a lot. */
export default function LotsList({ canCreate, deviceTypes }: { canCreate: boolean; deviceTypes: string[] }) {
  const { data, error, loading, reload } = useLots();
  const [message, setMessage] = useState<{ kind: 'ok' | 'error'; text: string }>();

  async function create(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = new FormData(form);
    try {
      const lot = await apiFetch<LotCreated>('/api/lots', {
        method: 'POST',
        json: { code: f.get('code'), device_type: f.get('device_type'), supplier: f.get('supplier'), notes: f.get('notes') },
      });
      setMessage({ kind: 'ok', text: `Lot ${lot.code} created.` });
      form.reset();
      reload();
    } catch (err) {
      setMessage({ kind: 'error', text: (err as Error).message });
    }
  }

  return (
    <div className="space-y-5">
      {canCreate && (
        <form onSubmit={create} className="card grid gap-3 md:grid-cols-[1fr_1fr_1fr_2fr_auto] items-end" aria-label="New lot">
          <div>
            <label className="field" htmlFor="lot-code">Lot code</label>
            <input className="input" id="lot-code" name="code" required />
          </div>
          <div>
            <label className="field" htmlFor="lot-type">Device type</label>
            <select className="input" id="lot-type" name="device_type" required>
              {deviceTypes.map((t) => <option key={t}>{t}</option>)}
            </select>
          </div>
          <div>
            <label className="field" htmlFor="lot-supplier">Supplier</label>
            <input className="input" id="lot-supplier" name="supplier" />
          </div>
          <div>
            <label className="field" htmlFor="lot-notes">Notes</label>
            <input className="input" id="lot-notes" name="notes" />
          </div>
          <button className="btn-primary" type="submit">Create lot</button>
        </form>
      )}
      {message && <p className={message.kind === 'ok' ? 'notice-info' : 'notice-error'} role="status">{message.text}</p>}
      {loading && !data && <Loading what="lots" />}
      {error && <ErrorNotice error={error} retry={reload} />}
      {data && data.lots.length === 0 && <Empty>No lots yet.{canCreate ? ' Create the first one above.' : ''}</Empty>}
      {data && data.lots.length > 0 && (
        <table className="table-plain bg-paper-raised" aria-label="Lots">
          <thead>
            <tr>
              <th>Lot</th>
              <th>Device type</th>
              <th>Supplier</th>
              <th>Received</th>
              <th className="text-right">Parts</th>
              <th>By status</th>
            </tr>
          </thead>
          <tbody>
            {data.lots.map((l) => (
              <tr key={l.code} data-testid={`lot-${l.code}`}>
                <td className="font-mono whitespace-nowrap"><a href={`/parts?lot=${encodeURIComponent(l.code)}`}>{l.code}</a></td>
                <td className="whitespace-nowrap">{l.device_type} <span className="text-ink-faint">({l.channel.toUpperCase()})</span></td>
                <td>{l.supplier || '—'}</td>
                <td className="whitespace-nowrap">{when(l.received_at)}</td>
                <td className="num">{l.part_count}</td>
                <td className="min-w-[14rem]">
                  <div className="flex flex-wrap gap-1">
                    {Object.entries(l.by_status).map(([s, n]) => (
                      <a key={s} className={`${statusClass(s)} no-underline`} href={`/parts?lot=${encodeURIComponent(l.code)}&status=${s}`}>
                        {n} {STATUS_WORDS[s] ?? s}
                      </a>
                    ))}
                  </div>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}

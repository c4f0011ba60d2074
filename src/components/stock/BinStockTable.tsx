import { useEffect, useState } from 'react';
import type { BinJson, BinSortKey, UpdateBinInput } from '~/contracts/bins';
import { apiFetch } from '../ui/api-client';
import { useApi, useApiMutation, useBinStock } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';

type BinRow = BinJson;

interface LocationOption {
  id: number;
  name: string;
}

type SortKey = BinSortKey;

const COLUMNS: { key: SortKey; label: string; numeric?: boolean }[] = [
  { key: 'device_type', label: 'Type' },
  { key: 'code', label: 'Bin' },
  { key: 'label', label: 'Range' },
  { key: 'location', label: 'Home location' },
  { key: 'on_hand', label: 'On hand', numeric: true },
  { key: 'reserved', label: 'Reserved', numeric: true },
  { key: 'issued', label: 'Issued', numeric: true },
  { key: 'low_stock_threshold', label: 'Low-stock threshold', numeric: true },
];

export interface StockFilters {
  device_type: string;
  q: string;
  location_id: string;
  low_only: boolean;
  include_empty: boolean;
  sort: SortKey;
  dir: 'asc' | 'desc';
  page: number;
  page_size: number;
}

function queryString(f: StockFilters): string {
  const p = new URLSearchParams();
  if (f.device_type) p.set('device_type', f.device_type);
  if (f.q) p.set('q', f.q);
  if (f.location_id) p.set('location_id', f.location_id);
  if (f.low_only) p.set('low_only', '1');
  if (!f.include_empty) p.set('include_empty', '0');
  p.set('sort', f.sort);
  p.set('dir', f.dir);
  p.set('page', String(f.page));
  p.set('page_size', String(f.page_size));
  return p.toString();
}

function EditableBin({ bin, locations, onSaved }: { bin: BinRow; locations: LocationOption[]; onSaved: (msg: string, ok: boolean) => void }) {
  const [threshold, setThreshold] = useState(String(bin.low_stock_threshold));
  const [location, setLocation] = useState(bin.location ? String(bin.location.id) : '');
  useEffect(() => {
    setThreshold(String(bin.low_stock_threshold));
    setLocation(bin.location ? String(bin.location.id) : '');
  }, [bin.low_stock_threshold, bin.location?.id]);
  const dirty = threshold !== String(bin.low_stock_threshold) || location !== (bin.location ? String(bin.location.id) : '');
  const update = useApiMutation((body: UpdateBinInput) => apiFetch<BinJson>(`/api/bins/${bin.id}`, { method: 'PUT', json: body }), ['bins']);
  function save() {
    update.mutate(
      { low_stock_threshold: Number(threshold), home_location_id: location ? Number(location) : null },
      { onSuccess: () => onSaved(`Bin ${bin.code} saved.`, true), onError: (e) => onSaved(e.message, false) },
    );
  }
  return (
    <>
      <td>
        <select aria-label={`Home location of ${bin.code}`} className="input min-w-[11rem] py-0.5 text-sm" value={location} onChange={(e) => setLocation(e.target.value)}>
          <option value="">— none —</option>
          {locations.map((l) => (
            <option key={l.id} value={l.id}>{l.name}</option>
          ))}
        </select>
      </td>
      <td className="num">{bin.on_hand}{bin.low && <span className="tag-fault ml-1">low</span>}</td>
      <td className="num">{bin.reserved}</td>
      <td className="num">{bin.issued}</td>
      <td className="num">
        <span className="inline-flex items-center gap-1">
          <input aria-label={`Low-stock threshold of ${bin.code}`} className="input w-20 py-0.5 text-right text-sm" type="number" min={0} value={threshold} onChange={(e) => setThreshold(e.target.value)} />
          <button type="button" className="btn-quiet py-0.5" disabled={!dirty} onClick={() => void save()}>Save</button>
        </span>
      </td>
    </>
  );
}

export default function BinStockTable({ deviceTypes, canEdit, initial }: { deviceTypes: string[]; canEdit: boolean; initial?: Partial<StockFilters> }) {
  const [f, setF] = useState<StockFilters>({
    device_type: '',
    q: '',
    location_id: '',
    low_only: false,
    include_empty: true,
    sort: 'code',
    dir: 'asc',
    page: 1,
    page_size: 50,
    ...initial,
  });
  const [search, setSearch] = useState(f.q);
  const [message, setMessage] = useState<{ text: string; ok: boolean }>();
  const qs = queryString(f);
  const { data, error, loading, reload } = useBinStock(qs);
  const locations = useApi<{ locations: LocationOption[] }>('/api/locations');
  useEffect(() => {
    const t = setTimeout(() => setF((old) => (old.q === search ? old : { ...old, q: search, page: 1 })), 300);
    return () => clearTimeout(t);
  }, [search]);
  useEffect(() => {
    const url = new URL(window.location.href);
    url.search = qs;
    window.history.replaceState(null, '', url);
  }, [qs]);

  const set = (patch: Partial<StockFilters>) => setF((old) => ({ ...old, page: 1, ...patch }));
  const sortBy = (key: SortKey) => setF((old) => ({ ...old, sort: key, dir: old.sort === key && old.dir === 'asc' ? 'desc' : 'asc', page: 1 }));
  const pages = data ? Math.max(1, Math.ceil(data.total / data.page_size)) : 1;
  const csv = `/api/bins/export.csv?${queryString({ ...f, page: 1 })}`;

  return (
    <div className="space-y-4">
      <form className="card grid gap-3 md:grid-cols-[12rem_1fr_14rem_auto_auto] items-end" onSubmit={(e) => e.preventDefault()} aria-label="Filter bins">
        <div>
          <label className="field" htmlFor="f-type">Device type</label>
          <select id="f-type" className="input" value={f.device_type} onChange={(e) => set({ device_type: e.target.value })}>
            <option value="">All types</option>
            {deviceTypes.map((t) => (
              <option key={t} value={t}>{t}</option>
            ))}
          </select>
        </div>
        <div>
          <label className="field" htmlFor="f-q">Search bin, range or location</label>
          <input id="f-q" className="input" value={search} placeholder="e.g. I07 or Drawer 3" onChange={(e) => setSearch(e.target.value)} />
        </div>
        <div>
          <label className="field" htmlFor="f-loc">Home location</label>
          <select id="f-loc" className="input" value={f.location_id} onChange={(e) => set({ location_id: e.target.value })}>
            <option value="">Any</option>
            {locations.data?.locations.map((l) => (
              <option key={l.id} value={l.id}>{l.name}</option>
            ))}
          </select>
        </div>
        <div className="flex flex-col gap-1 text-sm pb-1">
          <label className="flex items-center gap-1"><input type="checkbox" checked={f.low_only} onChange={(e) => set({ low_only: e.target.checked })} /> Low stock only</label>
          <label className="flex items-center gap-1"><input type="checkbox" checked={!f.include_empty} onChange={(e) => set({ include_empty: !e.target.checked })} /> Hide empty bins</label>
        </div>
        <a className="btn-quiet no-underline hover:no-underline" href={csv} download>Export CSV</a>
      </form>
      {message && <p className={message.ok ? 'notice-info' : 'notice-error'} role="status">{message.text}</p>}
      {loading && !data && <Loading what="bins" />}
      {error && <ErrorNotice error={error} retry={reload} />}
      {data && data.bins.length === 0 && <Empty>No bins match. Clear a filter, or check that the type has an active bin plan.</Empty>}
      {data && data.bins.length > 0 && (
        <div className="overflow-x-auto">
          <table className="table-plain bg-paper-raised" data-testid="bin-stock-table">
            <thead>
              <tr>
                {COLUMNS.map((c) => (
                  <th key={c.key} className={c.numeric ? 'text-right' : undefined} aria-sort={f.sort === c.key ? (f.dir === 'asc' ? 'ascending' : 'descending') : 'none'}>
                    <button type="button" className="font-semibold hover:text-channel-700" onClick={() => sortBy(c.key)}>
                      {c.label}
                      {f.sort === c.key ? (f.dir === 'asc' ? ' ▲' : ' ▼') : ''}
                    </button>
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {data.bins.map((b) => (
                <tr key={b.id} className={b.low ? 'bg-state-faultbg/40' : undefined}>
                  <td className="whitespace-nowrap">{b.device_type} <span className="text-ink-faint text-xs">v{b.plan_version}</span></td>
                  <td className="font-semibold whitespace-nowrap">{b.is_hold ? <span className="tag-held">{b.code}</span> : b.code}</td>
                  <td className="min-w-[10rem] text-ink-soft">{b.label}</td>
                  {canEdit ? (
                    <EditableBin bin={b} locations={locations.data?.locations ?? []} onSaved={(text, ok) => setMessage({ text, ok })} />
                  ) : (
                    <>
                      <td>{b.location?.name ?? <span className="text-ink-faint">not set</span>}</td>
                      <td className="num">{b.on_hand}{b.low && <span className="tag-fault ml-1">low</span>}</td>
                      <td className="num">{b.reserved}</td>
                      <td className="num">{b.issued}</td>
                      <td className="num">{b.low_stock_threshold || '—'}</td>
                    </>
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {data && data.total > 0 && (
        <nav className="flex items-center gap-3 text-sm" aria-label="Pages">
          <button type="button" className="btn-quiet" disabled={f.page <= 1} onClick={() => setF((o) => ({ ...o, page: o.page - 1 }))}>Previous</button>
          <span>Page {f.page} of {pages} · {data.total} bins</span>
          <button type="button" className="btn-quiet" disabled={f.page >= pages} onClick={() => setF((o) => ({ ...o, page: o.page + 1 }))}>Next</button>
          <label className="ml-auto flex items-center gap-1">Rows per page
            <select className="input w-20 py-0.5" value={f.page_size} onChange={(e) => set({ page_size: Number(e.target.value) })}>
              {[25, 50, 100, 250].map((n) => <option key={n} value={n}>{n}</option>)}
            </select>
          </label>
        </nav>
      )}
    </div>
  );
}

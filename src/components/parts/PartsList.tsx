import { useEffect, useState, type FormEvent } from 'react';
import { idssInDatasheetSign } from '~/core/units/datasheet-sign';
import { columnFormat } from '~/core/units/format-quantity';
import { percent } from './figures';
import { flagWord, STATUS_WORDS, statusClass } from './part-types';
import { useParts } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';

const FILTERS = ['q', 'status', 'device_type', 'lot', 'bin'] as const;
type Filters = Partial<Record<(typeof FILTERS)[number] | 'page', string>>;

function readFilters(): Filters {
  if (typeof window === 'undefined') return {};
  const p = new URLSearchParams(window.location.search);
  const out: Filters = {};
  for (const k of [...FILTERS, 'page'] as const) {
    const v = p.get(k);
    if (v) out[k] = v;
  }
  return out;
}

/** Searchable, filterable list of parts, paged on the server; the filters live in the URL. */
export default function PartsList({ deviceTypes, lots }: { deviceTypes: string[]; lots: string[] }) {
  const [filters, setFilters] = useState<Filters>({});
  useEffect(() => setFilters(readFilters()), []);
  const query = new URLSearchParams({ ...filters, page_size: '50' } as Record<string, string>).toString();
  const { data, error, loading, reload } = useParts(query);

  function apply(next: Filters) {
    setFilters(next);
    const qs = new URLSearchParams(next as Record<string, string>).toString();
    window.history.replaceState(null, '', qs ? `?${qs}` : window.location.pathname);
  }
  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const next: Filters = {};
    for (const k of FILTERS) {
      const v = String(f.get(k) ?? '').trim();
      if (v) next[k] = v;
    }
    apply(next);
  }
  const page = Number(filters.page ?? 1);
  // One unit per column over the rows of this page; IDSS in datasheet sign (negative for P).
  const rows = data?.parts ?? [];
  const col = {
    idss: columnFormat(rows.map((p) => (p.idss_a === null ? null : idssInDatasheetSign(p.idss_a, p.channel))), 'A', 4),
    vp: columnFormat(rows.map((p) => p.vp_v), 'V', 4),
    gfs: columnFormat(rows.map((p) => p.gfs_s), 'S', 4),
  };

  return (
    <div className="space-y-4">
      <form key={JSON.stringify(filters)} onSubmit={submit} className="card grid gap-3 md:grid-cols-[2fr_1fr_1fr_1fr_1fr_auto] items-end" aria-label="Find parts">
        <div>
          <label className="field" htmlFor="f-q">Serial contains</label>
          <input className="input" id="f-q" name="q" defaultValue={filters.q ?? ''} placeholder="e.g. 2611A-01" />
        </div>
        <div>
          <label className="field" htmlFor="f-status">Status</label>
          <select className="input" id="f-status" name="status" defaultValue={filters.status ?? ''}>
            <option value="">any</option>
            {Object.entries(STATUS_WORDS).map(([k, v]) => <option key={k} value={k}>{v}</option>)}
          </select>
        </div>
        <div>
          <label className="field" htmlFor="f-type">Device type</label>
          <select className="input" id="f-type" name="device_type" defaultValue={filters.device_type ?? ''}>
            <option value="">any</option>
            {deviceTypes.map((t) => <option key={t}>{t}</option>)}
          </select>
        </div>
        <div>
          <label className="field" htmlFor="f-lot">Lot</label>
          <select className="input" id="f-lot" name="lot" defaultValue={filters.lot ?? ''}>
            <option value="">any</option>
            {lots.map((t) => <option key={t}>{t}</option>)}
          </select>
        </div>
        <div>
          <label className="field" htmlFor="f-bin">Bin code</label>
          <input className="input" id="f-bin" name="bin" defaultValue={filters.bin ?? ''} />
        </div>
        <div className="flex gap-2">
          <button className="btn-primary" type="submit">Find</button>
          <button className="btn-quiet" type="button" onClick={() => apply({})}>Clear</button>
        </div>
      </form>
      {loading && !data && <Loading what="parts" />}
      {error && <ErrorNotice error={error} retry={reload} />}
      {data && data.parts.length === 0 && <Empty>No parts match these filters.</Empty>}
      {data && data.parts.length > 0 && (
        <>
          <p className="text-sm text-ink-soft" role="status">
            {data.total} part{data.total === 1 ? '' : 's'} · page {data.page} of {data.page_count}
          </p>
          <table className="table-plain bg-paper-raised" aria-label="Parts">
            <thead>
              <tr>
                <th>Serial</th>
                <th>Status</th>
                <th>Type · lot</th>
                <th>Bin</th>
                <th className="text-right">IDSS ({col.idss.unit})</th>
                <th className="text-right">VP ({col.vp.unit})</th>
                <th className="text-right">gfs ({col.gfs.unit})</th>
                <th className="text-right">RMS / IDSS</th>
                <th>Flags</th>
              </tr>
            </thead>
            <tbody>
              {data.parts.map((p) => (
                <tr key={p.serial}>
                  <td className="font-mono whitespace-nowrap"><a href={`/parts/${encodeURIComponent(p.serial)}`}>{p.serial}</a></td>
                  <td className="whitespace-nowrap"><span className={statusClass(p.status)}>{STATUS_WORDS[p.status] ?? p.status}</span></td>
                  <td className="min-w-[9rem]">{p.device_type}{p.lot ? <span className="text-ink-faint"> · {p.lot}</span> : null}</td>
                  <td className="min-w-[10rem]">{p.bin_code ?? <span className="text-ink-faint">—</span>}{p.location ? <span className="text-ink-faint"> · {p.location}</span> : null}</td>
                  <td className="num">{col.idss.number(p.idss_a === null ? null : idssInDatasheetSign(p.idss_a, p.channel))}</td>
                  <td className="num">{col.vp.number(p.vp_v)}</td>
                  <td className="num">{col.gfs.number(p.gfs_s)}</td>
                  <td className="num">{percent(p.rms_rel)}</td>
                  <td className="text-xs">{p.flags.map(flagWord).join(', ')}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <div className="flex items-center gap-2">
            <button className="btn-quiet" type="button" disabled={page <= 1} onClick={() => apply({ ...filters, page: String(page - 1) })}>Previous</button>
            <button className="btn-quiet" type="button" disabled={page >= data.page_count} onClick={() => apply({ ...filters, page: String(page + 1) })}>Next</button>
          </div>
        </>
      )}
    </div>
  );
}

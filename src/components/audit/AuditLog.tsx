import { useEffect, useState, type FormEvent } from 'react';
import type { AuditLogPage } from '~/contracts/audit';
import { auditActionWords } from '~/core/audit/describe-audit-entry';
import { useApi } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';
import AuditTrail from './AuditTrail';

const FILTERS = ['serial', 'person', 'action', 'from', 'to'] as const;
type Filters = Partial<Record<(typeof FILTERS)[number] | 'page', string>>;
const PAGE_SIZE = 50;

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

/** The whole audit log, newest first, searched and paged on the server; the search lives in the address. */
export default function AuditLog() {
  const [filters, setFilters] = useState<Filters | null>(null);
  useEffect(() => setFilters(readFilters()), []);
  const query = filters ? new URLSearchParams({ ...filters, page_size: String(PAGE_SIZE) } as Record<string, string>).toString() : null;
  const { data, error, loading, reload } = useApi<AuditLogPage>(query === null ? null : `/api/admin/audit?${query}`);

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
  const f = filters ?? {};
  const page = Number(f.page ?? 1);
  const pages = data ? Math.max(1, Math.ceil(data.total / data.page_size)) : 1;

  return (
    <div className="space-y-4">
      <form key={JSON.stringify(f)} onSubmit={submit} className="card grid gap-3 sm:grid-cols-2 lg:grid-cols-[1fr_1fr_1fr_auto_auto_auto] items-end" aria-label="Search the audit log">
        <div>
          <label className="field" htmlFor="a-serial">Serial or subject contains</label>
          <input className="input" id="a-serial" name="serial" defaultValue={f.serial ?? ''} placeholder="e.g. WS-N30-0101" />
        </div>
        <div>
          <label className="field" htmlFor="a-person">Person or station</label>
          <input className="input" id="a-person" name="person" defaultValue={f.person ?? ''} placeholder="e-mail, name or station" />
        </div>
        <div>
          <label className="field" htmlFor="a-action">Action</label>
          <select className="input" id="a-action" name="action" defaultValue={f.action ?? ''}>
            <option value="">any</option>
            {(data?.actions ?? []).map((a) => (
              <option key={a} value={a}>
                {auditActionWords(a)} ({a})
              </option>
            ))}
          </select>
        </div>
        <div>
          <label className="field" htmlFor="a-from">From</label>
          <input className="input" id="a-from" name="from" type="date" defaultValue={f.from ?? ''} />
        </div>
        <div>
          <label className="field" htmlFor="a-to">To</label>
          <input className="input" id="a-to" name="to" type="date" defaultValue={f.to ?? ''} />
        </div>
        <div className="flex gap-2">
          <button className="btn-primary" type="submit">Search</button>
          <button className="btn-quiet" type="button" onClick={() => apply({})}>Clear</button>
        </div>
      </form>
      {loading && !data && <Loading what="the audit log" />}
      {error && <ErrorNotice error={error} retry={reload} />}
      {data && data.entries.length === 0 && <Empty>Nothing in the audit log matches this search.</Empty>}
      {data && data.entries.length > 0 && (
        <section className="card">
          <p className="mb-2 text-sm text-ink-soft" role="status" data-testid="audit-count">
            {data.total} record{data.total === 1 ? '' : 's'}, newest first · page {data.page} of {pages}
          </p>
          <AuditTrail entries={data.entries} showSubject />
          <div className="mt-3 flex items-center gap-2">
            <button className="btn-quiet" type="button" disabled={page <= 1} onClick={() => apply({ ...f, page: String(page - 1) })}>
              Previous
            </button>
            <button className="btn-quiet" type="button" disabled={page >= pages} onClick={() => apply({ ...f, page: String(page + 1) })}>
              Next
            </button>
          </div>
        </section>
      )}
    </div>
  );
}

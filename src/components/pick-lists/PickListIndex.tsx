import { useState } from 'react';
import TabStrip from '../ui/TabStrip';
import { STATUS_TAG, dateTime, relativeTo } from '../match/figures';
import { usePickLists } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';

const FILTERS = [
  ['open', 'Open'],
  ['complete', 'Complete'],
  ['cancelled', 'Cancelled'],
  ['all', 'All'],
] as const;

type Filter = (typeof FILTERS)[number][0];

function isFilter(v: string | null): v is Filter {
  return FILTERS.some(([k]) => k === v);
}

/** The pick lists; the filter lives in the address (`?status=complete`) so it can be linked and reloaded. */
export default function PickListIndex({ initialStatus }: { initialStatus?: string | null }) {
  const [status, setStatusState] = useState<Filter>(isFilter(initialStatus ?? null) ? (initialStatus as Filter) : 'open');
  const setStatus = (next: Filter) => {
    setStatusState(next);
    const url = new URL(window.location.href);
    url.searchParams.set('status', next);
    window.history.replaceState(null, '', url);
  };
  const { data, error, loading, reload } = usePickLists(status);
  const rows = data?.pick_lists ?? [];
  return (
    <div className="space-y-4">
      <TabStrip label="Which pick lists" tabs={FILTERS.map(([id, label]) => ({ id, label }))} selected={status} onSelect={setStatus} />
      {loading && !data && <Loading what="pick lists" />}
      {error && <ErrorNotice error={error} retry={reload} />}
      {data && rows.length === 0 && <Empty>{status === 'open' ? 'No open pick lists: nothing is waiting to be picked.' : 'No pick lists here.'}</Empty>}
      {rows.length > 0 && (
        <div className="card p-0 overflow-x-auto">
          <table className="table-plain" aria-label="Pick lists">
            <thead>
              <tr>
                <th>List</th>
                <th>Status</th>
                <th>For</th>
                <th>Sets</th>
                <th>Picked</th>
                <th>Start at</th>
                <th>Made</th>
                <th>Reservation expires</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((l) => (
                <tr key={l.id}>
                  <td className="whitespace-nowrap">
                    <a className="font-mono" href={`/pick-lists/${l.id}`}>{l.code}</a>
                  </td>
                  <td>
                    <span className={STATUS_TAG[l.status] ?? 'tag-plain'}>{l.status}</span>
                  </td>
                  <td>
                    {l.reservation.designer_name}
                    {l.reservation.purpose && <span className="text-ink-faint"> · {l.reservation.purpose}</span>}
                  </td>
                  <td className="whitespace-nowrap">
                    {l.sets} × {l.device_type ?? '—'}
                  </td>
                  <td className="num">
                    {l.lines_picked} / {l.lines_total}
                  </td>
                  <td className="min-w-[9rem]">{l.status === 'open' ? (l.first_location ?? '—') : '—'}</td>
                  <td className="whitespace-nowrap">{dateTime(l.created_at)}</td>
                  <td className="whitespace-nowrap">{l.reservation.status === 'active' ? relativeTo(l.reservation.expires_at) : l.reservation.status}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}

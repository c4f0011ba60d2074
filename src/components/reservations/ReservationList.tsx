import { SHAPE_WORDS, STATUS_TAG, dateTime, relativeTo } from '../match/figures';
import { useReservations } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';

export default function ReservationList() {
  const { data, error, loading, reload } = useReservations();
  if (loading && !data) return <Loading what="your reservations" />;
  if (error) return <ErrorNotice error={error} retry={reload} />;
  const rows = data?.reservations ?? [];
  if (rows.length === 0) {
    return (
      <Empty>
        You have no reservations yet. <a href="/match">Ask for matched sets</a> and confirm a proposal to reserve it.
      </Empty>
    );
  }
  return (
    <div className="card p-0 overflow-x-auto">
      <table className="table-plain" aria-label="Your reservations">
        <thead>
          <tr>
            <th>Reservation</th>
            <th>Status</th>
            <th>Sets</th>
            <th>Type</th>
            <th>Made</th>
            <th>Expires</th>
            <th>Pick list</th>
            <th>For</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.id}>
              <td className="whitespace-nowrap">
                <a href={`/reservations/${r.id}`} className="font-mono">{r.code}</a>
              </td>
              <td>
                <span className={STATUS_TAG[r.status] ?? 'tag-plain'}>{r.status}</span>
              </td>
              <td className="min-w-[9rem]">
                {r.sets} {r.shape ? SHAPE_WORDS[r.shape]?.[r.sets === 1 ? 'one' : 'many'] : ''} <span className="text-ink-faint">({r.parts} parts)</span>
              </td>
              <td className="whitespace-nowrap">{r.device_type ?? '—'}</td>
              <td className="whitespace-nowrap">{dateTime(r.created_at)}</td>
              <td className="whitespace-nowrap">{r.status === 'active' ? <span title={dateTime(r.expires_at)}>{relativeTo(r.expires_at)}</span> : <span className="text-ink-faint">—</span>}</td>
              <td>
                {r.pick_list ? (
                  <>
                    <span className={STATUS_TAG[r.pick_list.status] ?? 'tag-plain'}>{r.pick_list.status}</span>{' '}
                    <span className="text-ink-faint">{r.pick_list.lines_picked}/{r.pick_list.lines_total} picked</span>
                  </>
                ) : (
                  '—'
                )}
              </td>
              <td className="max-w-[16rem] truncate">{r.purpose || <span className="text-ink-faint">—</span>}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

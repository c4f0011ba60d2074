import { useState, type FormEvent } from 'react';
import { formatDateTime } from '~/core/units/format-date';
import { apiFetch } from '../ui/api-client';
import type { StationCreated, StationJson } from '~/contracts/stations';
import { useStations } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';

function when(iso: string | null) {
  return formatDateTime(iso);
}

/** Test-station tokens: create (the token is shown once), list, revoke. */
export default function StationsAdmin() {
  const { data, error, loading, reload } = useStations();
  const [fresh, setFresh] = useState<StationCreated>();
  const [message, setMessage] = useState<{ kind: 'ok' | 'error'; text: string }>();

  async function create(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const name = String(new FormData(form).get('name') ?? '');
    try {
      const made = await apiFetch<StationCreated>('/api/admin/stations', { method: 'POST', json: { name } });
      setFresh(made);
      setMessage(undefined);
      form.reset();
      reload();
    } catch (err) {
      setMessage({ kind: 'error', text: (err as Error).message });
    }
  }
  async function revoke(s: StationJson) {
    if (!window.confirm(`Revoke the token of ${s.name}? The station can no longer upload until it gets a new token.`)) return;
    try {
      await apiFetch(`/api/admin/stations/${s.id}`, { method: 'DELETE' });
      setMessage({ kind: 'ok', text: `Token of ${s.name} revoked.` });
      reload();
    } catch (err) {
      setMessage({ kind: 'error', text: (err as Error).message });
    }
  }

  return (
    <div className="space-y-5">
      <form onSubmit={create} className="card flex flex-wrap items-end gap-3" aria-label="New station token">
        <div className="min-w-[16rem] flex-1">
          <label className="field" htmlFor="station-name">Station name</label>
          <input className="input" id="station-name" name="name" required placeholder="e.g. Curve tracer bench 2" />
        </div>
        <button className="btn-primary" type="submit">Create token</button>
      </form>
      {fresh && (
        <div className="notice-caution" role="status" data-testid="fresh-token">
          <p className="font-semibold">Token for {fresh.name} — copy it now; it is shown only this once.</p>
          <pre className="my-2 overflow-x-auto rounded bg-white px-3 py-2 font-mono text-sm">{fresh.token}</pre>
          <p className="text-xs">
            The station sends it as <code>Authorization: Bearer &lt;token&gt;</code> with <code>POST /api/sweeps</code>. It may only upload sweeps.
          </p>
          <button type="button" className="btn-quiet mt-2" onClick={() => void navigator.clipboard?.writeText(fresh.token)}>Copy token</button>
        </div>
      )}
      {message && <p className={message.kind === 'ok' ? 'notice-info' : 'notice-error'} role="status">{message.text}</p>}
      {loading && !data && <Loading what="stations" />}
      {error && <ErrorNotice error={error} retry={reload} />}
      {data && data.stations.length === 0 && <Empty>No station tokens yet.</Empty>}
      {data && data.stations.length > 0 && (
        <table className="table-plain bg-paper-raised">
          <thead>
            <tr><th>Station</th><th>Token starts</th><th>Created</th><th>Last used</th><th>State</th><th></th></tr>
          </thead>
          <tbody>
            {data.stations.map((s) => (
              <tr key={s.id} data-testid={`station-${s.name}`}>
                <td className="min-w-[8rem] font-semibold">{s.name}</td>
                <td className="font-mono text-xs">{s.token_prefix}…</td>
                <td className="whitespace-nowrap">{when(s.created_at)}</td>
                <td className="whitespace-nowrap">{when(s.last_used_at)}</td>
                <td>{s.revoked_at ? <span className="tag-fault">revoked {when(s.revoked_at)}</span> : <span className="tag-ok">active</span>}</td>
                <td className="text-right">{!s.revoked_at && <button type="button" className="btn-quiet" onClick={() => void revoke(s)}>Revoke</button>}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}

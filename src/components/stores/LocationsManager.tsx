import { useState, type FormEvent } from 'react';
import { apiFetch } from '../ui/api-client';
import type { LocationJson } from '~/contracts/locations';
import { useLocations } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';

function LocationLine({ l, canEdit, canLabel, act }: { l: LocationJson; canEdit: boolean; canLabel: boolean; act: (fn: () => Promise<unknown>, ok: string) => void }) {
  const [editing, setEditing] = useState(false);
  const [name, setName] = useState(l.name);
  const [barcode, setBarcode] = useState(l.barcode);
  const [description, setDescription] = useState(l.description);
  if (editing) {
    return (
      <tr>
        <td><input aria-label="Name" className="input py-0.5" value={name} onChange={(e) => setName(e.target.value)} /></td>
        <td><input aria-label="Barcode" className="input py-0.5 font-mono" value={barcode} onChange={(e) => setBarcode(e.target.value)} /></td>
        <td><input aria-label="Description" className="input py-0.5" value={description} onChange={(e) => setDescription(e.target.value)} /></td>
        <td className="num">{l.bin_count}</td>
        <td className="num">{l.part_count}</td>
        <td className="text-right whitespace-nowrap">
          <button type="button" className="btn-primary py-0.5" onClick={() => (act(() => apiFetch(`/api/locations/${l.id}`, { method: 'PUT', json: { name, barcode, description } }), `Saved ${name}.`), setEditing(false))}>Save</button>{' '}
          <button type="button" className="btn-quiet py-0.5" onClick={() => setEditing(false)}>Cancel</button>
        </td>
      </tr>
    );
  }
  return (
    <tr data-testid={`location-${l.barcode}`}>
      <td className="font-semibold">{l.name}</td>
      <td className="font-mono text-sm">{l.barcode}</td>
      <td className="text-ink-soft">{l.description}</td>
      <td className="num">{l.bin_count}</td>
      <td className="num">{l.part_count}</td>
      <td className="text-right whitespace-nowrap">
        {canLabel && (
          <>
            <a className="btn-quiet py-0.5 no-underline hover:no-underline" href={`/labels/print?kind=location&locations=${l.id}`} target="_blank" rel="noopener">Print label</a>{' '}
          </>
        )}
        {canEdit && (
          <>
            <button type="button" className="btn-quiet py-0.5" onClick={() => setEditing(true)}>Edit</button>{' '}
            <button
              type="button"
              className="btn-quiet py-0.5"
              disabled={l.bin_count + l.part_count > 0}
              title={l.bin_count + l.part_count > 0 ? 'In use: bins call it home or parts are there' : undefined}
              onClick={() => act(() => apiFetch(`/api/locations/${l.id}`, { method: 'DELETE' }), `Deleted ${l.name}.`)}
            >
              Delete
            </button>
          </>
        )}
      </td>
    </tr>
  );
}

export default function LocationsManager({ canEdit, canLabel = false }: { canEdit: boolean; canLabel?: boolean }) {
  const { data, error, loading, reload } = useLocations();
  const [message, setMessage] = useState<{ ok: boolean; text: string }>();
  function act(fn: () => Promise<unknown>, ok: string) {
    fn()
      .then(() => (setMessage({ ok: true, text: ok }), reload()))
      .catch((e: Error) => setMessage({ ok: false, text: e.message }));
  }
  function create(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = new FormData(form);
    const name = String(f.get('name'));
    const barcode = String(f.get('barcode') ?? '').trim();
    act(
      () => apiFetch('/api/locations', { method: 'POST', json: { name, description: f.get('description') ?? '', ...(barcode ? { barcode } : {}) } }).then(() => form.reset()),
      `Created ${name}.`,
    );
  }
  return (
    <div className="space-y-5">
      {canEdit && (
        <form onSubmit={create} className="card grid gap-3 md:grid-cols-[1fr_14rem_1fr_auto] items-end" aria-label="New location">
          <div><label className="field" htmlFor="loc-name">Name</label><input id="loc-name" name="name" className="input" required placeholder="Cabinet B · Drawer 4" /></div>
          <div><label className="field" htmlFor="loc-barcode">Barcode (blank: from the name)</label><input id="loc-barcode" name="barcode" className="input font-mono" /></div>
          <div><label className="field" htmlFor="loc-desc">Description</label><input id="loc-desc" name="description" className="input" /></div>
          <button className="btn-primary" type="submit">Add location</button>
        </form>
      )}
      {message && <p className={message.ok ? 'notice-info' : 'notice-error'} role="status">{message.text}</p>}
      {loading && !data && <Loading what="locations" />}
      {error && <ErrorNotice error={error} retry={reload} />}
      {data && data.locations.length === 0 && <Empty>No locations yet{canEdit ? ': add the first cabinet or drawer above.' : '.'}</Empty>}
      {data && data.locations.length > 0 && (
        <table className="table-plain bg-paper-raised">
          <thead><tr><th>Name</th><th>Barcode</th><th>Description</th><th className="text-right">Bins at home</th><th className="text-right">Parts here</th><th></th></tr></thead>
          <tbody>{data.locations.map((l) => <LocationLine key={`${l.id}-${l.name}-${l.barcode}`} l={l} canEdit={canEdit} canLabel={canLabel} act={act} />)}</tbody>
        </table>
      )}
    </div>
  );
}

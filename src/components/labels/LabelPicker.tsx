import { useState } from 'react';
import type { BinStockPage } from '~/contracts/bins';
import { useApi, useLocations } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';

export interface LayoutOption {
  id: string;
  name: string;
}

type Kind = 'bin' | 'part' | 'location';

/** Picks bins, serials or locations, a label size and a symbology, then opens the print page. */
export default function LabelPicker({ deviceTypes, layouts, initialKind }: { deviceTypes: string[]; layouts: LayoutOption[]; initialKind?: string | null }) {
  const [kind, setKind] = useState<Kind>(initialKind === 'part' || initialKind === 'location' ? initialKind : 'bin');
  const [pickedLocations, setPickedLocations] = useState<Set<number>>(new Set());
  const [type, setType] = useState(deviceTypes[0] ?? '');
  const [layout, setLayout] = useState(layouts[0]?.id ?? '');
  const [symbology, setSymbology] = useState<'code128' | 'datamatrix'>('code128');
  const [picked, setPicked] = useState<Set<number>>(new Set());
  const [serials, setSerials] = useState('');
  const bins = useApi<BinStockPage>(kind === 'bin' && type ? `/api/bins?device_type=${encodeURIComponent(type)}&page_size=1000` : null);
  const locations = useLocations(kind === 'location');

  const params = new URLSearchParams({ kind, layout, symbology });
  if (kind === 'bin') params.set('bins', [...picked].join(','));
  else if (kind === 'location') params.set('locations', [...pickedLocations].join(','));
  else params.set('serials', serials.split(/[\s,;]+/).filter(Boolean).join(','));
  const ready = kind === 'bin' ? picked.size > 0 : kind === 'location' ? pickedLocations.size > 0 : serials.trim().length > 0;
  const toggleLocation = (id: number) => setPickedLocations((s) => { const n = new Set(s); if (n.has(id)) n.delete(id); else n.add(id); return n; });
  const toggle = (id: number) => setPicked((s) => { const n = new Set(s); if (n.has(id)) n.delete(id); else n.add(id); return n; });

  return (
    <div className="space-y-4">
      <div className="card grid gap-4 md:grid-cols-4 items-end">
        <fieldset>
          <legend className="field">Labels for</legend>
          <div className="flex flex-wrap gap-x-4">
            {(['bin', 'part', 'location'] as const).map((k) => (
              <label key={k} className="inline-flex min-h-11 items-center gap-1.5 text-sm">
                <input type="radio" name="kind" checked={kind === k} onChange={() => setKind(k)} /> {k === 'bin' ? 'Bins' : k === 'part' ? 'Parts' : 'Locations'}
              </label>
            ))}
          </div>
        </fieldset>
        <div>
          <label className="field" htmlFor="lbl-layout">Label size</label>
          <select id="lbl-layout" className="input" value={layout} onChange={(e) => setLayout(e.target.value)}>
            {layouts.map((l) => <option key={l.id} value={l.id}>{l.name}</option>)}
          </select>
        </div>
        <div>
          <label className="field" htmlFor="lbl-sym">Barcode</label>
          <select id="lbl-sym" className="input" value={symbology} onChange={(e) => setSymbology(e.target.value as 'code128' | 'datamatrix')}>
            <option value="code128">Code 128 (linear)</option>
            <option value="datamatrix">Data Matrix (2-D, small)</option>
          </select>
        </div>
        <a className={`btn-primary no-underline hover:no-underline ${ready ? '' : 'pointer-events-none opacity-50'}`} aria-disabled={!ready} href={`/labels/print?${params}`} target="_blank" rel="noopener">Open print page</a>
      </div>
      {kind === 'location' ? (
        <div className="card space-y-3">
          <div className="flex flex-wrap items-end gap-3">
            <button type="button" className="btn-quiet" onClick={() => setPickedLocations(new Set(locations.data?.locations.map((l) => l.id)))}>Select all</button>
            <button type="button" className="btn-quiet" onClick={() => setPickedLocations(new Set())}>None</button>
            <span className="text-sm text-ink-soft">{pickedLocations.size} selected · the label carries the barcode the scanner reads when parts move there</span>
          </div>
          {locations.loading && !locations.data && <Loading what="locations" />}
          {locations.error && <ErrorNotice error={locations.error} retry={locations.reload} />}
          {locations.data && locations.data.locations.length === 0 && <Empty>No locations yet: add them on the Locations page.</Empty>}
          {locations.data && locations.data.locations.length > 0 && (
            <ul className="grid gap-1 sm:grid-cols-2 lg:grid-cols-3 text-sm max-h-[28rem] overflow-y-auto">
              {locations.data.locations.map((l) => (
                <li key={l.id}>
                  <label className="flex min-h-11 items-start gap-2 py-1">
                    <input type="checkbox" className="mt-1" checked={pickedLocations.has(l.id)} onChange={() => toggleLocation(l.id)} />
                    <span><span className="font-semibold">{l.name}</span> <span className="font-mono text-xs text-ink-soft">{l.barcode}</span> <span className="text-ink-faint">· {l.part_count} part{l.part_count === 1 ? '' : 's'}</span></span>
                  </label>
                </li>
              ))}
            </ul>
          )}
        </div>
      ) : kind === 'part' ? (
        <div className="card">
          <label className="field" htmlFor="lbl-serials">Serials (scan or paste, one per line)</label>
          <textarea id="lbl-serials" className="input font-mono h-40" value={serials} onChange={(e) => setSerials(e.target.value)} />
        </div>
      ) : (
        <div className="card space-y-3">
          <div className="flex flex-wrap items-end gap-3">
            <div>
              <label className="field" htmlFor="lbl-type">Device type</label>
              <select id="lbl-type" className="input w-48" value={type} onChange={(e) => (setType(e.target.value), setPicked(new Set()))}>
                {deviceTypes.map((t) => <option key={t} value={t}>{t}</option>)}
              </select>
            </div>
            <button type="button" className="btn-quiet" onClick={() => setPicked(new Set(bins.data?.bins.map((b) => b.id)))}>Select all</button>
            <button type="button" className="btn-quiet" onClick={() => setPicked(new Set(bins.data?.bins.filter((b) => b.on_hand > 0).map((b) => b.id)))}>Bins with stock</button>
            <button type="button" className="btn-quiet" onClick={() => setPicked(new Set())}>None</button>
            <span className="text-sm text-ink-soft">{picked.size} selected</span>
          </div>
          {bins.loading && !bins.data && <Loading what="bins" />}
          {bins.error && <ErrorNotice error={bins.error} retry={bins.reload} />}
          {bins.data && bins.data.bins.length === 0 && <Empty>This type has no active bin plan.</Empty>}
          {bins.data && bins.data.bins.length > 0 && (
            <ul className="grid gap-1 sm:grid-cols-2 lg:grid-cols-3 text-sm max-h-[28rem] overflow-y-auto">
              {bins.data.bins.map((b) => (
                <li key={b.id}>
                  <label className="flex min-h-11 items-start gap-2 py-1">
                    <input type="checkbox" className="mt-1" checked={picked.has(b.id)} onChange={() => toggle(b.id)} />
                    <span><span className="font-semibold">{b.code}</span> <span className="text-ink-soft">{b.label}</span> <span className="text-ink-faint">· {b.on_hand} on hand</span></span>
                  </label>
                </li>
              ))}
            </ul>
          )}
        </div>
      )}
    </div>
  );
}

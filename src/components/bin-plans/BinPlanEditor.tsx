import { useEffect, useMemo, useState } from 'react';
import type { BinPlanActivated, BinPlanPreview } from '~/contracts/bin-plans';
import type { BinQuantity } from '~/core/binning';
import { apiFetch } from '../ui/api-client';
import { useBinPlans, useInvalidate } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';
import { formatDate } from '~/core/units/format-date';
import { axisToForm, defaultAxes, formToPlan, QUANTITY_NAMES, type AxisForm } from './plan-form';
import PlanGridPreview, { type PreviewPoint } from './PlanGridPreview';

function AxisEditor({ axis, index, onChange, onRemove }: { axis: AxisForm; index: number; onChange: (a: AxisForm) => void; onRemove?: () => void }) {
  const unit = axis.quantity === 'idss' ? 'mA' : 'V';
  const id = (s: string) => `axis${index}-${s}`;
  return (
    <fieldset className="rounded border border-paper-line p-3 space-y-3">
      <legend className="px-1 text-sm font-semibold">Axis {index + 1}</legend>
      <div className="grid gap-3 md:grid-cols-[1fr_auto]">
        <div>
          <label className="field" htmlFor={id('q')}>Quantity</label>
          <select id={id('q')} className="input" value={axis.quantity} onChange={(e) => onChange({ ...axis, quantity: e.target.value as BinQuantity })}>
            {(Object.keys(QUANTITY_NAMES) as BinQuantity[]).map((q) => <option key={q} value={q}>{QUANTITY_NAMES[q]}</option>)}
          </select>
        </div>
        <fieldset className="pt-5 text-sm">
          <legend className="sr-only">Edges</legend>
          <label className="mr-3"><input type="radio" checked={axis.kind === 'uniform'} onChange={() => onChange({ ...axis, kind: 'uniform' })} /> Uniform width</label>
          <label><input type="radio" checked={axis.kind === 'explicit'} onChange={() => onChange({ ...axis, kind: 'explicit' })} /> Explicit edges</label>
        </fieldset>
      </div>
      {axis.quantity === 'vgs_at_current' && (
        <div className="max-w-xs">
          <label className="field" htmlFor={id('ref')}>Reference drain current (mA)</label>
          <input id={id('ref')} className="input" inputMode="decimal" value={axis.referenceCurrentMa} onChange={(e) => onChange({ ...axis, referenceCurrentMa: e.target.value })} />
        </div>
      )}
      {axis.kind === 'uniform' ? (
        <div className="grid gap-3 grid-cols-3">
          <div><label className="field" htmlFor={id('start')}>First edge ({unit})</label><input id={id('start')} className="input" inputMode="decimal" value={axis.start} onChange={(e) => onChange({ ...axis, start: e.target.value })} /></div>
          <div><label className="field" htmlFor={id('width')}>Width ({unit})</label><input id={id('width')} className="input" inputMode="decimal" value={axis.width} onChange={(e) => onChange({ ...axis, width: e.target.value })} /></div>
          <div><label className="field" htmlFor={id('count')}>Number of ranges</label><input id={id('count')} className="input" inputMode="numeric" value={axis.count} onChange={(e) => onChange({ ...axis, count: e.target.value })} /></div>
        </div>
      ) : (
        <div>
          <label className="field" htmlFor={id('edges')}>Edges in {unit}, ascending, comma-separated</label>
          <input id={id('edges')} className="input font-mono" value={axis.edges} onChange={(e) => onChange({ ...axis, edges: e.target.value })} placeholder={axis.quantity === 'idss' ? '2, 4, 6, 8, 12, 20' : '-4, -3, -2.5, -2, -1.5, -0.6'} />
        </div>
      )}
      <p className="text-xs text-ink-faint">Each range includes its lower edge and excludes its upper one. Parts outside every range, or without the figure, go to the hold bin.</p>
      {onRemove && <button type="button" className="btn-quiet" onClick={onRemove}>Remove this axis</button>}
    </fieldset>
  );
}

export default function BinPlanEditor() {
  const { data, error, loading, reload } = useBinPlans();
  const invalidate = useInvalidate();
  const [typeName, setTypeName] = useState('');
  const [axes, setAxes] = useState<AxisForm[]>([]);
  const [name, setName] = useState('');
  const [preview, setPreview] = useState<BinPlanPreview>();
  const [message, setMessage] = useState<{ ok: boolean; text: string }>();
  const [busy, setBusy] = useState(false);

  const type = data?.device_types.find((t) => t.name === typeName);
  const versions = useMemo(() => data?.plans.filter((p) => p.device_type === typeName) ?? [], [data, typeName]);
  const active = versions.find((p) => p.is_active);

  useEffect(() => {
    if (data && !typeName && data.device_types[0]) setTypeName(data.device_types[0].name);
  }, [data, typeName]);
  useEffect(() => {
    if (!type) return;
    // A stored definition without axes (written outside this editor) starts from the defaults.
    setAxes(active?.definition?.axes?.length ? active.definition.axes.map(axisToForm) : defaultAxes(type));
    setName('');
    setPreview(undefined);
  }, [typeName, active?.id]);

  const change = (i: number, a: AxisForm) => (setAxes((xs) => xs.map((x, k) => (k === i ? a : x))), setPreview(undefined));

  async function runPreview() {
    setBusy(true);
    setMessage(undefined);
    try {
      setPreview(await apiFetch<BinPlanPreview>('/api/bin-plans/preview', { method: 'POST', json: { device_type: typeName, name, definition: formToPlan(axes) } }));
    } catch (e) {
      setPreview(undefined);
      setMessage({ ok: false, text: (e as Error).message });
    } finally {
      setBusy(false);
    }
  }

  async function confirm() {
    if (!preview) return;
    setBusy(true);
    try {
      const r = await apiFetch<BinPlanActivated>('/api/bin-plans', {
        method: 'POST',
        json: { device_type: typeName, name, definition: formToPlan(axes), based_on_plan_id: preview.based_on_plan_id },
      });
      setMessage({ ok: true, text: `Version ${r.plan.version} of ${typeName} is active: ${r.moved_count} parts re-binned, ${r.newly_binned_count} binned for the first time. Print new labels for changed bins.` });
      setPreview(undefined);
      // Activation re-bins parts: bin stock and part rows shown elsewhere on the page change too.
      void invalidate('bin-plans', 'bins', 'parts');
    } catch (e) {
      setMessage({ ok: false, text: (e as Error).message });
    } finally {
      setBusy(false);
    }
  }

  if (loading && !data) return <Loading what="bin plans" />;
  if (error) return <ErrorNotice error={error} retry={reload} />;
  if (!data || data.device_types.length === 0) return <Empty>No device types yet; add one under Device types first.</Empty>;

  return (
    <div className="grid gap-5 xl:grid-cols-[minmax(0,1fr)_28rem]">
      <div className="space-y-4">
        <div className="card space-y-4">
          <div className="flex flex-wrap items-end gap-4">
            <div>
              <label className="field" htmlFor="plan-type">Device type</label>
              <select id="plan-type" className="input w-64" value={typeName} onChange={(e) => setTypeName(e.target.value)}>
                {data.device_types.map((t) => <option key={t.id} value={t.name}>{t.name} ({t.channel.toUpperCase()}-channel)</option>)}
              </select>
            </div>
            <div className="flex-1 min-w-[12rem]">
              <label className="field" htmlFor="plan-name">Name of this version (optional)</label>
              <input id="plan-name" className="input" value={name} onChange={(e) => (setName(e.target.value), setPreview(undefined))} placeholder="e.g. finer IDSS steps for audio pairs" />
            </div>
          </div>
          <p className="text-sm text-ink-soft">
            {active ? `Editing from version ${active.version} (active). Saving makes version ${(versions[0]?.version ?? 0) + 1}; earlier versions and every part's bin history stay.` : 'This type has no bin plan yet; saving makes version 1.'}
            {type && ` IDSS is taken at |VDS| = ${type.vds_test_v} V. ${type.channel === 'n' ? 'VP is negative for this N-channel type.' : 'VP is positive for this P-channel type.'}`}
          </p>
          {axes.map((a, i) => (
            <AxisEditor key={i} axis={a} index={i} onChange={(x) => change(i, x)} onRemove={axes.length > 1 ? () => (setAxes((xs) => xs.filter((_, k) => k !== i)), setPreview(undefined)) : undefined} />
          ))}
          <div className="flex flex-wrap gap-3">
            {axes.length < 2 && (
              <button type="button" className="btn-quiet" onClick={() => setAxes((xs) => [...xs, { ...defaultAxes(type ?? { channel: 'n' })[1], quantity: xs[0]?.quantity === 'vp' ? 'idss' : 'vp' }])}>Add a second axis</button>
            )}
            <button type="button" className="btn-primary" disabled={busy} onClick={() => void runPreview()}>Preview the moves</button>
          </div>
        </div>
        {message && <p className={message.ok ? 'notice-info' : 'notice-error'} role={message.ok ? 'status' : 'alert'}>{message.text}</p>}
        {preview && (
          <section className="card space-y-3" aria-label="Preview">
            <h2 className="text-lg">Before saving: what version {preview.next_version} would do</h2>
            <ul className="grid grid-cols-2 md:grid-cols-4 gap-3 text-sm">
              <li><span className="block text-ink-faint text-xs">Bins</span><span className="text-xl font-semibold">{preview.bin_count}</span></li>
              <li><span className="block text-ink-faint text-xs">Parts considered</span><span className="text-xl font-semibold">{preview.parts_considered}</span></li>
              <li><span className="block text-ink-faint text-xs">Change bin</span><span className="text-xl font-semibold text-state-review" data-testid="moved-count">{preview.moved_count}</span></li>
              <li><span className="block text-ink-faint text-xs">Stay / first bin</span><span className="text-xl font-semibold">{preview.unchanged_count} / {preview.newly_binned_count}</span></li>
            </ul>
            <p className="text-sm" data-testid="physical-moves">
              <strong>{preview.physical_move_count}</strong> part{preview.physical_move_count === 1 ? '' : 's'} on the shelves must be carried to another bag
              {preview.moved_count > preview.physical_move_count && `; ${preview.moved_count - preview.physical_move_count} more change bin on record only (accepted but not shelved, or issued)`}.
            </p>
            <PlanGridPreview oldPlan={preview.old_definition} newPlan={preview.definition} points={preview.points} />
            {preview.points_left_off > 0 && <p className="text-xs text-ink-faint">The first {preview.points.length} parts are drawn; the counts cover all {preview.parts_considered}.</p>}
            {preview.move_counts.length > 0 ? (
              <details>
                <summary className="cursor-pointer text-sm font-semibold text-ink-soft">From → to, bin by bin ({preview.move_counts.length} pairs)</summary>
                <div className="mt-2 max-h-72 overflow-y-auto">
                  <table className="table-plain">
                    <thead><tr><th>From bin</th><th>To bin</th><th className="text-right">Parts</th></tr></thead>
                    <tbody>{preview.move_counts.map((m) => <tr key={`${m.from}-${m.to}`}><td>{m.from}</td><td>{m.to}</td><td className="num">{m.count}</td></tr>)}</tbody>
                  </table>
                </div>
              </details>
            ) : (
              <p className="text-sm text-ink-soft">No part already binned changes bin.</p>
            )}
            {Object.keys(preview.definition.codes ?? {}).length > 0 && (
              <p className="text-xs text-ink-soft">
                {Object.keys(preview.definition.codes ?? {}).length} ranges are new: they get codes of version {preview.next_version} (e.g. {Object.values(preview.definition.codes ?? {})[0]}), because a code an earlier version printed always keeps its range.
              </p>
            )}
            {preview.relabelled.length > 0 && <p className="notice-caution">{preview.relabelled.length} bins keep their code but change range: reprint their labels ({preview.relabelled.slice(0, 6).map((r) => r.code).join(', ')}{preview.relabelled.length > 6 ? ', …' : ''}).</p>}
            <div className="flex gap-3">
              <button type="button" className="btn-primary" disabled={busy} onClick={() => void confirm()}>
                Save version {preview.next_version} and re-bin {preview.moved_count + preview.newly_binned_count} parts
              </button>
              <button type="button" className="btn-quiet" onClick={() => setPreview(undefined)}>Keep editing</button>
            </div>
          </section>
        )}
      </div>
      <aside className="card space-y-2" aria-label="Versions">
        <h2 className="text-lg">Versions of {typeName}</h2>
        {versions.length === 0 && <Empty>No versions yet.</Empty>}
        <ol className="space-y-2">
          {versions.map((p) => (
            <li key={p.id} className="rounded border border-paper-line p-2 text-sm">
              <div className="flex items-center gap-2">
                <span className="font-semibold">Version {p.version}</span>
                {p.is_active && <span className="tag-ok">active</span>}
                <span className="ml-auto text-ink-faint">{formatDate(p.created_at)}</span>
              </div>
              {p.name && <div>{p.name}</div>}
              <div className="text-ink-soft">{p.bin_count} bins · {p.definition.axes.map((a) => a.quantity.toUpperCase().replace('_AT_CURRENT', '@I')).join(' × ')}{p.created_by ? ` · ${p.created_by}` : ''}</div>
            </li>
          ))}
        </ol>
      </aside>
    </div>
  );
}

import { useState, type FormEvent } from 'react';
import { formatOpenRange } from '~/core/units/format-quantity';
import { ApiError, apiFetch } from '../ui/api-client';
import type { DeviceTypeJson } from '~/contracts/device-types';
import { useDeviceTypes } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';

const num = (v: FormDataEntryValue | null) => {
  const s = String(v ?? '').trim().replace(',', '.');
  return s === '' ? null : Number(s);
};
const mA = (v: FormDataEntryValue | null) => {
  const n = num(v);
  return n === null ? null : n / 1000;
};

/** The form's own label of each field the server names, so a refusal points at the box to correct. */
const FIELD_LABELS: Record<string, string> = {
  name: 'Name',
  channel: 'Channel',
  description: 'Description',
  vds_test_v: 'IDSS test |VDS| (V)',
  nominal_temperature_c: 'Nominal temperature (°C)',
  vtotc_v_per_c: '|VP| change (mV/°C)',
  betatce_pct_per_c: 'BETA change (%/°C)',
  idss_min_a: 'IDSS min (mA)',
  idss_max_a: 'IDSS max (mA)',
  vp_min_v: 'VP min (V, datasheet sign)',
  vp_max_v: 'VP max (V, datasheet sign)',
};

function refusalText(err: unknown): string {
  const fields = err instanceof ApiError ? err.body?.error.fields : undefined;
  if (!Array.isArray(fields) || fields.length === 0) return (err as Error).message;
  const parts = fields.map((f: { field?: string; message?: string }) => `${FIELD_LABELS[f.field ?? ''] ?? f.field} — ${f.message}`);
  return `Check ${parts.length === 1 ? 'this field' : 'these fields'}: ${parts.join('; ')}.`;
}

function TypeForm({ initial, onSaved, onCancel }: { initial?: DeviceTypeJson; onSaved: (msg: string) => void; onCancel?: () => void }) {
  const [error, setError] = useState<string>();
  const [channel, setChannel] = useState<'n' | 'p'>(initial?.channel ?? 'n');
  async function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = new FormData(form);
    const body = {
      name: String(f.get('name') ?? ''),
      channel,
      description: String(f.get('description') ?? ''),
      vds_test_v: num(f.get('vds_test_v')),
      nominal_temperature_c: num(f.get('nominal_temperature_c')) ?? 25,
      // Entered as |VP| growth in mV/°C; stored as ngspice's VTOTC on the (negative) VTO.
      vtotc_v_per_c: -(num(f.get('vp_growth_mv_per_c')) ?? 2.2) / 1000,
      betatce_pct_per_c: num(f.get('betatce_pct_per_c')) ?? -0.7,
      idss_min_a: mA(f.get('idss_min_ma')),
      idss_max_a: mA(f.get('idss_max_ma')),
      vp_min_v: num(f.get('vp_min_v')),
      vp_max_v: num(f.get('vp_max_v')),
    };
    const notNumbers = Object.entries(body).filter(([k, v]) => (typeof v === 'number' && !Number.isFinite(v)) || (k === 'vds_test_v' && v === null)).map(([k]) => FIELD_LABELS[k] ?? k);
    if (notNumbers.length) {
      setError(`Check ${notNumbers.length === 1 ? 'this field' : 'these fields'}: ${notNumbers.join(', ')} — expected a number.`);
      return;
    }
    try {
      if (initial) await apiFetch(`/api/admin/device-types/${initial.id}`, { method: 'PUT', json: body });
      else await apiFetch('/api/admin/device-types', { method: 'POST', json: body });
      setError(undefined);
      if (!initial) form.reset();
      onSaved(`${body.name} saved.`);
    } catch (err) {
      setError(refusalText(err));
    }
  }
  const p = initial ? `edit-${initial.id}` : 'new';
  const v = (x: number | null | undefined, scale = 1) => (x === null || x === undefined ? '' : String(Number((x * scale).toPrecision(6))));
  return (
    <form onSubmit={submit} className="card grid gap-3 md:grid-cols-4" aria-label={initial ? `Edit ${initial.name}` : 'New device type'}>
      <div>
        <label className="field" htmlFor={`${p}-name`}>Name</label>
        <input className="input" id={`${p}-name`} name="name" required defaultValue={initial?.name} />
      </div>
      <div>
        <label className="field" htmlFor={`${p}-channel`}>Channel</label>
        <select className="input" id={`${p}-channel`} value={channel} onChange={(e) => setChannel(e.target.value as 'n' | 'p')}>
          <option value="n">N-channel</option>
          <option value="p">P-channel</option>
        </select>
      </div>
      <div>
        <label className="field" htmlFor={`${p}-vds`}>IDSS test |VDS| (V)</label>
        <input className="input" id={`${p}-vds`} name="vds_test_v" required inputMode="decimal" defaultValue={v(initial?.vds_test_v ?? 10)} />
      </div>
      <div>
        <label className="field" htmlFor={`${p}-temp`}>Nominal temperature (°C)</label>
        <input className="input" id={`${p}-temp`} name="nominal_temperature_c" inputMode="decimal" defaultValue={v(initial?.nominal_temperature_c ?? 25)} />
      </div>
      <div>
        <label className="field" htmlFor={`${p}-vtotc`}>|VP| change (mV/°C)</label>
        <input className="input" id={`${p}-vtotc`} name="vp_growth_mv_per_c" inputMode="decimal" defaultValue={v(-(initial?.vtotc_v_per_c ?? -0.0022), 1000)} aria-describedby={`${p}-tc-help`} />
      </div>
      <div>
        <label className="field" htmlFor={`${p}-betatce`}>BETA change (%/°C)</label>
        <input className="input" id={`${p}-betatce`} name="betatce_pct_per_c" inputMode="decimal" defaultValue={v(initial?.betatce_pct_per_c ?? -0.7)} aria-describedby={`${p}-tc-help`} />
      </div>
      <p id={`${p}-tc-help`} className="text-xs text-ink-faint md:col-span-2 self-end">
        Used to compare parts measured at different temperatures (ngspice's VTOTC = −|VP| change, BETATCE). Defaults +2.2 mV/°C and −0.7 %/°C are
        classic application-note figures (from memory); put your own parts' figures here when you have them.
      </p>
      <div>
        <label className="field" htmlFor={`${p}-idss-min`}>IDSS min (mA)</label>
        <input className="input" id={`${p}-idss-min`} name="idss_min_ma" inputMode="decimal" defaultValue={v(initial?.idss_min_a, 1000)} />
      </div>
      <div>
        <label className="field" htmlFor={`${p}-idss-max`}>IDSS max (mA)</label>
        <input className="input" id={`${p}-idss-max`} name="idss_max_ma" inputMode="decimal" defaultValue={v(initial?.idss_max_a, 1000)} />
      </div>
      <div>
        <label className="field" htmlFor={`${p}-vp-min`}>VP min (V, datasheet sign)</label>
        <input className="input" id={`${p}-vp-min`} name="vp_min_v" inputMode="decimal" defaultValue={v(initial?.vp_min_v)} placeholder={channel === 'n' ? 'e.g. -4' : 'e.g. 0.6'} />
      </div>
      <div>
        <label className="field" htmlFor={`${p}-vp-max`}>VP max (V, datasheet sign)</label>
        <input className="input" id={`${p}-vp-max`} name="vp_max_v" inputMode="decimal" defaultValue={v(initial?.vp_max_v)} placeholder={channel === 'n' ? 'e.g. -0.6' : 'e.g. 4'} />
      </div>
      <div className="md:col-span-3">
        <label className="field" htmlFor={`${p}-desc`}>Description</label>
        <input className="input" id={`${p}-desc`} name="description" defaultValue={initial?.description} />
      </div>
      <div className="flex items-end gap-2">
        <button className="btn-primary" type="submit">{initial ? 'Save' : 'Add type'}</button>
        {onCancel && <button className="btn-quiet" type="button" onClick={onCancel}>Cancel</button>}
      </div>
      {error && <p className="notice-error md:col-span-4" role="alert">{error}</p>}
    </form>
  );
}

/** Spec limits as one range in one unit ("−4.0 to −0.6 V", not "−4.00 V to −600.00 mV"). */
const limits = (lo: number | null, hi: number | null, unit: 'A' | 'V') => formatOpenRange(lo, hi, unit, 1);

/** Device types: the channel, IDSS test VDS, nominal temperature and spec limits fitting uses. */
export default function DeviceTypesAdmin() {
  const { data, error, loading, reload } = useDeviceTypes();
  const [editing, setEditing] = useState<number | null>(null);
  const [message, setMessage] = useState<string>();
  const saved = (msg: string) => {
    setMessage(msg);
    setEditing(null);
    reload();
  };
  return (
    <div className="space-y-5">
      <TypeForm onSaved={saved} />
      {message && <p className="notice-info" role="status">{message}</p>}
      {loading && !data && <Loading what="device types" />}
      {error && <ErrorNotice error={error} retry={reload} />}
      {data && data.device_types.length === 0 && <Empty>No device types yet.</Empty>}
      {data && data.device_types.length > 0 && (
        <table className="table-plain bg-paper-raised">
          <thead>
            <tr><th>Type</th><th>Channel</th><th className="text-right">Test |VDS|</th><th className="text-right">Nominal</th><th className="text-right">Temperature coefficients</th><th>IDSS limits</th><th>VP limits</th><th></th></tr>
          </thead>
          <tbody>
            {data.device_types.map((t) =>
              editing === t.id ? (
                <tr key={t.id}><td colSpan={8}><TypeForm initial={t} onSaved={saved} onCancel={() => setEditing(null)} /></td></tr>
              ) : (
                <tr key={t.id} data-testid={`type-${t.name}`}>
                  <td><div className="font-semibold">{t.name}</div><div className="text-xs text-ink-faint">{t.description}</div></td>
                  <td>{t.channel.toUpperCase()} ({t.channel === 'n' ? 'NJF' : 'PJF'})</td>
                  <td className="num">{t.vds_test_v} V</td>
                  <td className="num">{t.nominal_temperature_c} °C</td>
                  <td className="num">|VP| {Number((-t.vtotc_v_per_c * 1000).toPrecision(3))} mV/°C, BETA {t.betatce_pct_per_c} %/°C</td>
                  <td>{limits(t.idss_min_a, t.idss_max_a, 'A')}</td>
                  <td>{limits(t.vp_min_v, t.vp_max_v, 'V')}</td>
                  <td className="text-right"><button type="button" className="btn-quiet" onClick={() => setEditing(t.id)}>Edit</button></td>
                </tr>
              ),
            )}
          </tbody>
        </table>
      )}
    </div>
  );
}

import { useEffect, useMemo, useState, type FormEvent, type ReactNode } from 'react';
import { AppError } from '~/core/errors';
import { normalizeSerial } from '~/core/serial/normalize-serial';
import { checkInputsAgainstPart, estimateDefaultsForPart, type PartFigures } from '~/core/estimates/defaults-from-part';
import { idssInDatasheetSign, vdsInDatasheetSign } from '~/core/units/datasheet-sign';
import { columnFormat, formatMeasuredNumber, formatPlain } from '~/core/units/format-quantity';
import type { MatchedSetEstimateJson, MixerEstimateJson, SelfBiasEstimateJson, SelfBiasPointJson } from '~/contracts/estimates';
import type { PartDetailJson } from '~/contracts/parts';
import { sig as formatQuantity } from './sig';
import { ApiError, apiFetch } from '../ui/api-client';
import { Empty } from '../ui/states';
import {
  DEFAULT_FORM,
  FIELD_LABELS,
  FormInputError,
  fieldErrorsFromServer,
  mixerBody,
  partDefaults,
  partFields,
  PART_DERIVED_FIELDS,
  readNumber,
  readSetRef,
  selfBiasBody,
  type EstimateForm,
  type FieldErrors,
  type FormField,
} from './estimate-form';
import { MixerTable } from './MixerTable';
import { MatchedSetCard } from './MatchedSetCard';


interface PartOutcome {
  key: string;
  title: string;
  selfBias?: SelfBiasEstimateJson | null;
  mixer?: MixerEstimateJson | null;
  errors: string[];
}

function Field({ field, errors, children, hint, label, caution }: { field: FormField; errors: FieldErrors; children: ReactNode; hint?: string; label?: string; caution?: string }) {
  const err = errors[field];
  return (
    <div>
      <label className="field" htmlFor={`est-${field}`}>
        {label ?? FIELD_LABELS[field]}
      </label>
      {children}
      {hint && !err && <p className="mt-0.5 text-xs text-ink-faint">{hint}</p>}
      {err && (
        <p className="mt-0.5 text-xs text-state-fault" id={`est-${field}-error`} role="alert">
          {err}
        </p>
      )}
      {caution && !err && (
        <p className="mt-0.5 text-xs text-state-review" id={`est-${field}-caution`} data-testid={`caution-${field}`}>
          {caution}
        </p>
      )}
    </div>
  );
}

function v(x: number, digits = 4) {
  return formatQuantity(x, 'V', digits);
}

interface BiasRow {
  label: string;
  rsOhm: number;
  idA: number;
  vgsV: number;
  gmS: number;
  gosS: number;
  gain: { bypassed: number; unbypassed: number } | null;
  saturated: boolean;
  source: 'measured' | 'model';
  vgsSigmaV: number | null;
  testId?: string;
}

const fromBody = (label: string, p: SelfBiasPointJson): BiasRow => ({
  label,
  rsOhm: p.source_resistor_ohm,
  idA: p.drain_current_a,
  vgsV: p.vgs_v,
  gmS: p.gm_s,
  gosS: p.gos_s,
  gain: p.gain ? { bypassed: p.gain.bypassed_v_per_v, unbypassed: p.gain.unbypassed_v_per_v } : null,
  saturated: p.saturated,
  source: p.source,
  vgsSigmaV: p.vgs_sigma_v,
});

/**
 * The resistor the target needs rounded to the nearest IEC 60063 E24 and E96 values, and the
 * current each sets, as the server solved them for the same part.
 */
function preferredRows(r: SelfBiasEstimateJson): BiasRow[] {
  return r.preferred_resistors.map((p) => ({ ...fromBody(`nearest ${p.series} (IEC 60063)`, p), testId: `preferred-${p.series}` }));
}

function SelfBiasTable({ r }: { r: SelfBiasEstimateJson }) {
  const rows: BiasRow[] = [];
  const bodies: SelfBiasPointJson[] = [];
  if (r.for_target_current) {
    rows.push(fromBody('for the target current', r.for_target_current), ...preferredRows(r));
    bodies.push(r.for_target_current);
  }
  if (r.for_source_resistor) {
    rows.push(fromBody('with the given resistor', r.for_source_resistor));
    bodies.push(r.for_source_resistor);
  }
  // One unit per column over the rows shown.
  const col = {
    rs: columnFormat(rows.map((x) => x.rsOhm), 'Ω', 4),
    id: columnFormat(rows.map((x) => x.idA), 'A', 4),
    vgs: columnFormat(rows.map((x) => x.vgsV), 'V', 4),
    gm: columnFormat(rows.map((x) => x.gmS), 'S', 4),
    gos: columnFormat(rows.map((x) => x.gosS), 'S', 3),
  };
  const gainText = (g: number | undefined) => (g === undefined ? '—' : formatPlain(g, 2));
  return (
    <div className="overflow-x-auto">
      <table className="table-plain" aria-label="Self-bias operating points">
        <thead>
          <tr>
            <th>Case</th>
            <th className="num">RS ({col.rs.unit})</th>
            <th className="num">ID ({col.id.unit})</th>
            <th className="num">VGS ({col.vgs.unit})</th>
            <th className="num">gm ({col.gm.unit})</th>
            <th className="num">gos ({col.gos.unit})</th>
            <th className="num">Gain, RS bypassed (V/V)</th>
            <th className="num">Gain, RS unbypassed (V/V)</th>
            <th>Saturation</th>
            <th>Figures from</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((p) => (
            <tr key={p.label} data-testid={p.testId} className={p.testId ? 'text-ink-soft' : undefined}>
              <td>{p.label}</td>
              <td className="num">{col.rs.number(p.rsOhm)}</td>
              <td className="num">{col.id.number(p.idA)}</td>
              <td className="num">{col.vgs.number(p.vgsV)}</td>
              <td className="num">{col.gm.number(p.gmS)}</td>
              <td className="num">{col.gos.number(p.gosS)}</td>
              <td className="num">{gainText(p.gain?.bypassed)}</td>
              <td className="num">{gainText(p.gain?.unbypassed)}</td>
              <td>{p.saturated ? <span className="tag-ok">saturated</span> : <span className="tag-fault">not saturated</span>}</td>
              <td data-testid="figure-source">
                {p.source === 'measured' ? 'measurements' : 'model (outside the measurements)'}
                {p.vgsSigmaV !== null ? `, VGS ± ${formatQuantity(p.vgsSigmaV, 'V', 2)}` : ''}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {bodies.some((p) => p.gain) && (
        <p className="text-xs text-ink-faint mt-1">Gain into RD = {formatQuantity(bodies.find((p) => p.gain)!.gain!.drain_load_ohm, 'Ω', 3)}, at |VDS| {formatQuantity(bodies[0].vds_v, 'V', 3)}, gos included.</p>
      )}
      {r.for_target_current && <p className="text-xs text-ink-faint mt-1">Preferred values: the nearest E24 (5 %) and E96 (1 %) resistors of IEC 60063, and the current each sets in this part.</p>}
      {bodies.flatMap((p) => p.warnings).map((w) => (
        <p key={w} className="notice-caution mt-2">
          {w}
        </p>
      ))}
    </div>
  );
}

function PartCard({ o }: { o: PartOutcome }) {
  const part = o.selfBias?.part ?? o.mixer?.part ?? null;
  const warnings = [...new Set([...(o.selfBias?.warnings ?? []), ...(o.mixer?.warnings ?? [])])];
  return (
    <section className="card space-y-4" aria-label={`Estimates for ${o.title}`}>
      <header className="flex flex-wrap items-baseline gap-x-4 gap-y-1">
        <h2>{o.title}</h2>
        {part && (
          <span className="text-sm text-ink-soft">
            {part.device_type} ({part.channel.toUpperCase()}) · lot {part.lot ?? '—'} · fit #{part.fit_id} ({part.fit_review.replace('_', ' ')}) · IDSS{' '}
            {formatQuantity(idssInDatasheetSign(part.idss_a, part.channel), 'A', 4)} at VDS {formatQuantity(vdsInDatasheetSign(part.idss_vds_v, part.channel), 'V', 3)} · VP {v(part.vp_v)} · λ {formatMeasuredNumber(part.lambda_per_v, null, 3)[0]} /V
            {part.rs_ohm > 0 || part.rd_ohm > 0 ? ` · RS ${formatQuantity(part.rs_ohm, 'Ω')}, RD ${formatQuantity(part.rd_ohm, 'Ω')}` : ''}
          </span>
        )}
      </header>
      {o.errors.map((e) => (
        <p key={e} className="notice-error" role="alert">
          {e}
        </p>
      ))}
      {warnings.map((w) => (
        <p key={w} className="notice-caution">
          {w}
        </p>
      ))}
      {o.selfBias && (
        <div>
          <h3 className="mb-1">Self-bias</h3>
          <SelfBiasTable r={o.selfBias} />
        </div>
      )}
      {o.mixer && (
        <div>
          <h3 className="mb-1">Square-law mixer</h3>
          <p className="text-sm mb-2">
            Bias VGS0 {v(o.mixer.bias.vgs0_v)}
            {o.mixer.bias.source_resistor_ohm !== null && ` (self-bias with ${formatQuantity(o.mixer.bias.source_resistor_ohm, 'Ω')})`} · drive across gate–source: RF{' '}
            {v(o.mixer.effective_drive.rf_v)}, LO {v(o.mixer.effective_drive.lo_v)} peak · DC drain current {formatQuantity(o.mixer.dc_drain_current_a, 'A')} ·{' '}
            <strong>conversion transconductance {formatQuantity(o.mixer.conversion_transconductance_s, 'S')}</strong>
          </p>
          <MixerTable rows={o.mixer.products} partKey={o.title} />
        </div>
      )}
    </section>
  );
}

/** A number typed by a person ("−" and a decimal comma accepted); undefined when blank or not a number. */
function typed(text: string): number | undefined {
  const raw = text.trim().replace('\u2212', '-').replace(',', '.');
  if (raw === '') return undefined;
  const v = Number(raw);
  return Number.isFinite(v) ? v : undefined;
}
const scaled = (text: string, factor: number) => {
  const v = typed(text);
  return v === undefined ? undefined : v * factor;
};

function messageOf(e: unknown): string {
  return e instanceof Error ? e.message : String(e);
}

/** Self-bias, mixer and matched-set estimates for data-sheet values, a stored part or a set. */
export default function EstimatesWorkbench({ initialSerial, initialSet }: { initialSerial?: string; initialSet?: string }) {
  const [form, setForm] = useState<EstimateForm>(
    initialSet
      ? { ...DEFAULT_FORM, source: 'set', set_ref: initialSet }
      : initialSerial
        ? { ...DEFAULT_FORM, source: 'part', serial: initialSerial }
        : DEFAULT_FORM,
  );
  const [errors, setErrors] = useState<FieldErrors>({});
  const [formMessage, setFormMessage] = useState<string>();
  const [busy, setBusy] = useState(false);
  const [outcomes, setOutcomes] = useState<PartOutcome[]>([]);
  const [setResult, setSetResult] = useState<MatchedSetEstimateJson | null>(null);
  const set = (patch: Partial<EstimateForm>) => setForm((f) => ({ ...f, ...patch }));
  // Inputs the person typed keep their value; the others follow the part.
  const [touched, setTouched] = useState<ReadonlySet<FormField>>(new Set());
  const [stored, setStored] = useState<(PartFigures & { serial: string }) | null>(null);
  const [storedNote, setStoredNote] = useState<string>();

  useEffect(() => {
    if (form.source !== 'part') return;
    const serial = normalizeSerial(form.serial);
    if (!serial) {
      setStored(null);
      setStoredNote(undefined);
      return;
    }
    let live = true;
    const timer = setTimeout(() => {
      apiFetch<PartDetailJson>(`/api/parts/${encodeURIComponent(serial)}`)
        .then((p) => {
          if (!live) return;
          if (p.idss_a === null || p.vp_v === null) {
            setStored(null);
            setStoredNote(`${serial} has no fit yet, so nothing to start from.`);
          } else {
            setStored({ serial, idssA: p.idss_a, vpV: p.vp_v });
            setStoredNote(undefined);
          }
        })
        .catch((e: Error) => {
          if (!live) return;
          setStored(null);
          setStoredNote(e.message);
        });
    }, 350);
    return () => {
      live = false;
      clearTimeout(timer);
    };
  }, [form.source, form.serial]);

  const figures: PartFigures | null = useMemo(() => {
    if (form.source === 'datasheet') {
      const idss = typed(form.idss_ma);
      const vp = typed(form.vp_v);
      return idss !== undefined && vp !== undefined && idss > 0 && vp !== 0 ? { idssA: idss * 1e-3, vpV: vp } : null;
    }
    if (form.source === 'part' && stored && stored.serial === normalizeSerial(form.serial)) return stored;
    return null;
  }, [form.source, form.idss_ma, form.vp_v, form.serial, stored]);

  useEffect(() => {
    if (!figures) return;
    const d = partDefaults(estimateDefaultsForPart(figures));
    setForm((f) => {
      const next = { ...f };
      let changed = false;
      for (const k of PART_DERIVED_FIELDS) {
        if (!touched.has(k) && f[k] !== d[k]) {
          next[k] = d[k];
          changed = true;
        }
      }
      return changed ? next : f;
    });
    // Only a new part resets the defaults; typing elsewhere must not.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [figures?.idssA, figures?.vpV]);

  /** What this part cannot take among the inputs, beside each field. */
  const live = useMemo(() => {
    const errs: FieldErrors = {};
    const cautions: FieldErrors = {};
    if (!figures) return { errors: errs, cautions };
    const target = typed(form.target_ma);
    const problems = checkInputsAgainstPart(figures, {
      targetCurrentA: target === undefined ? undefined : target * 1e-3,
      vgs0V: form.mixer ? (form.bias_mode === 'vgs0' ? typed(form.vgs0_v) : form.bias_mode === 'half_vp' ? estimateDefaultsForPart(figures).vgs0V : undefined) : undefined,
      loAmplitudeV: form.mixer ? scaled(form.lo_mv, 1e-3) : undefined,
      rfAmplitudeV: form.mixer ? scaled(form.rf_mv, 1e-3) : undefined,
    });
    const field = { targetCurrentA: 'target_ma', vgs0V: 'vgs0_v', loAmplitudeV: 'lo_mv', rfAmplitudeV: 'rf_mv' } as const;
    for (const p of problems) (p.severity === 'error' ? errs : cautions)[field[p.field]] = p.message;
    return { errors: errs, cautions };
  }, [figures, form.target_ma, form.mixer, form.bias_mode, form.vgs0_v, form.lo_mv, form.rf_mv]);
  const shownErrors: FieldErrors = { ...live.errors, ...errors };

  /** VGS0 = VP/2 of the part a request is for (its own VP for each part of a set). */
  async function halfVpOf(part: Parameters<typeof selfBiasBody>[1]): Promise<number> {
    if ('vp_v' in part) return estimateDefaultsForPart({ idssA: part.idss_a, vpV: part.vp_v }).vgs0V;
    if (stored && stored.serial === part.serial) return estimateDefaultsForPart(stored).vgs0V;
    const p = await apiFetch<PartDetailJson>(`/api/parts/${encodeURIComponent(part.serial)}`);
    if (p.idss_a === null || p.vp_v === null) throw new AppError('estimate_vgs0_unknown', { serial: part.serial });
    return estimateDefaultsForPart({ idssA: p.idss_a, vpV: p.vp_v }).vgs0V;
  }

  const input = (field: FormField, extra: Record<string, unknown> = {}) => ({
    id: `est-${field}`,
    className: `input ${errors[field] ? 'border-state-fault' : ''}`,
    value: String(form[field]),
    onChange: (e: { target: { value: string } }) => {
      set({ [field]: e.target.value } as Partial<EstimateForm>);
      setTouched((t) => (t.has(field) ? t : new Set([...t, field])));
    },
    'aria-label': FIELD_LABELS[field],
    'aria-invalid': errors[field] ? true : undefined,
    'aria-describedby': errors[field] ? `est-${field}-error` : undefined,
    inputMode: 'decimal' as const,
    ...extra,
  });

  async function estimateOne(part: Parameters<typeof selfBiasBody>[1], title: string, serverErrors: FieldErrors): Promise<PartOutcome> {
    const outcome: PartOutcome = { key: title, title, errors: [] };
    const local: FieldErrors = {};
    const sb = selfBiasBody(form, part, local);
    let vgs0PerPart: number | undefined;
    if (form.mixer && form.bias_mode === 'half_vp') {
      try {
        vgs0PerPart = await halfVpOf(part);
      } catch (e) {
        outcome.errors.push(`Mixer: ${messageOf(e)}`);
      }
    }
    const mx = form.mixer && !(form.bias_mode === 'half_vp' && vgs0PerPart === undefined) ? mixerBody(form, part, local, vgs0PerPart) : null;
    const remap = (fe: FieldErrors): FieldErrors => {
      if (form.source !== 'set' || !fe.serial) return fe;
      const { serial, ...rest } = fe;
      return { ...rest, set_ref: serial };
    };
    const calls: Promise<void>[] = [];
    if (sb) {
      calls.push(
        apiFetch<SelfBiasEstimateJson>('/api/estimates/self-bias', { method: 'POST', json: sb })
          .then((r) => void (outcome.selfBias = r))
          .catch((e) => {
            outcome.errors.push(`Self-bias: ${messageOf(e)}`);
            if (e instanceof ApiError) Object.assign(serverErrors, remap(fieldErrorsFromServer('self-bias', e.body)));
          }),
      );
    }
    if (mx) {
      calls.push(
        apiFetch<MixerEstimateJson>('/api/estimates/mixer', { method: 'POST', json: mx })
          .then((r) => void (outcome.mixer = r))
          .catch((e) => {
            outcome.errors.push(`Mixer: ${messageOf(e)}`);
            if (e instanceof ApiError) Object.assign(serverErrors, remap(fieldErrorsFromServer('mixer', e.body)));
          }),
      );
    }
    await Promise.all(calls);
    return outcome;
  }

  async function run(e: FormEvent) {
    e.preventDefault();
    setFormMessage(undefined);
    const local: FieldErrors = {};
    try {
      let parts: { ref: Parameters<typeof selfBiasBody>[1]; title: string }[] = [];
      let setOut: MatchedSetEstimateJson | null = null;
      if (form.source === 'set') {
        const ref = readSetRef(form.set_ref);
        if ('serials' in ref && ref.serials.length < 2) local.set_ref = 'expected a reservation id, or two or more serials separated by spaces or commas';
        const target = readNumber(form, 'target_ma', local, false, 1e-3);
        if (target === undefined && !local.target_ma) local.target_ma = 'needed to compare the parts of a set at one current';
        const vds = readNumber(form, 'vds_v', local, true);
        const rd = readNumber(form, 'rd_ohm', local, false);
        const lo = form.mixer ? readNumber(form, 'lo_mv', local, false, 1e-3) : undefined;
        if (Object.keys(local).length) throw new FormInputError(local);
        try {
          setOut = await apiFetch<MatchedSetEstimateJson>('/api/estimates/set', {
            method: 'POST',
            json: { ...ref, target_drain_current_a: target, vds_v: vds, ...(rd !== undefined ? { drain_load_ohm: rd } : {}), ...(lo !== undefined ? { lo_amplitude_v: lo } : {}) },
          });
        } catch (err) {
          if (err instanceof ApiError) throw new FormInputError(fieldErrorsFromServer('set', err.body), err.message);
          throw err;
        }
        parts = setOut.sets.flatMap((s) => s.parts.map((p) => ({ ref: { serial: p.serial }, title: p.serial })));
      } else {
        const ref = partFields(form, local);
        // Check every input before asking the server, so all mistakes show at once.
        selfBiasBody(form, ref ?? { serial: '' }, local);
        if (form.mixer) mixerBody(form, ref ?? { serial: '' }, local);
        Object.assign(local, live.errors);
        if (Object.keys(local).length || !ref) throw new FormInputError(local);
        parts = [{ ref, title: 'serial' in ref ? ref.serial : `IDSS ${form.idss_ma} mA, VP ${form.vp_v.trim().replace(/^-/, '\u2212')} V` }];
      }
      const probe: FieldErrors = {};
      for (const p of parts) {
        selfBiasBody(form, p.ref, probe);
        if (form.mixer) mixerBody(form, p.ref, probe);
      }
      if (Object.keys(probe).length) throw new FormInputError(probe);
      setBusy(true);
      const serverErrors: FieldErrors = {};
      const results = await Promise.all(parts.map((p) => estimateOne(p.ref, p.title, serverErrors)));
      setErrors(serverErrors);
      setOutcomes(results);
      setSetResult(setOut);
      if (Object.keys(serverErrors).length) setFormMessage(new FormInputError(serverErrors).message);
      if (!results.some((r) => r.selfBias || r.mixer) && !results.some((r) => r.errors.length)) {
        setFormMessage('Nothing to estimate: give a target drain current or a source resistor, or switch the mixer on.');
      }
    } catch (err) {
      // Results of an earlier press no longer answer the inputs on screen.
      setOutcomes([]);
      setSetResult(null);
      if (err instanceof FormInputError) {
        setErrors(err.fields);
        setFormMessage(err.message);
      } else {
        setFormMessage(messageOf(err));
      }
    } finally {
      setBusy(false);
    }
  }

  const drive = (p: 'lo' | 'rf') => (
    <fieldset className="rounded border border-paper-line p-3 grid gap-3 grid-cols-2 md:grid-cols-4 items-start">
      <legend className="px-1 text-sm font-semibold">{p === 'lo' ? 'LO (local oscillator)' : 'RF (signal)'}</legend>
      <Field field={`${p}_mv`} errors={shownErrors} label="Amplitude (mV peak)" caution={live.cautions[`${p}_mv`]}>
        <input {...input(`${p}_mv`)} />
      </Field>
      <Field field={`${p}_terminal`} errors={shownErrors} label="Drives the">
        <select {...input(`${p}_terminal`, { inputMode: undefined })}>
          <option value="gate">gate</option>
          <option value="source">source</option>
        </select>
      </Field>
      <Field field={`${p}_mhz`} errors={shownErrors} label="Frequency (MHz)">
        <input {...input(`${p}_mhz`)} />
      </Field>
      <Field field={`${p}_leak_mv`} errors={shownErrors} label="Leak (mV peak)" hint="in-phase copy on the other terminal">
        <input {...input(`${p}_leak_mv`)} placeholder="0" />
      </Field>
    </fieldset>
  );

  return (
    <div className="space-y-6">
      <form onSubmit={run} className="space-y-4" aria-label="Stage estimate inputs" noValidate>
        <div className="grid gap-4 xl:grid-cols-[1fr_1fr]">
          <section className="card space-y-3" aria-label="Part">
            <h2>1 · Part</h2>
            <div className="flex flex-wrap gap-4 text-sm" role="radiogroup" aria-label="Part source">
              {(
                [
                  ['datasheet', 'Data-sheet IDSS and VP'],
                  ['part', 'A stored part (serial)'],
                  ['set', 'A set (reservation or serials)'],
                ] as const
              ).map(([val, label]) => (
                <label key={val} className="flex items-center gap-1.5">
                  <input type="radio" name="source" checked={form.source === val} onChange={() => set({ source: val })} />
                  {label}
                </label>
              ))}
            </div>
            {form.source === 'datasheet' && (
              <div className="grid gap-3 sm:grid-cols-3">
                <Field field="idss_ma" errors={shownErrors}>
                  <input {...input('idss_ma')} />
                </Field>
                <Field field="vp_v" errors={shownErrors} hint="negative: N-channel; positive: P">
                  <input {...input('vp_v')} />
                </Field>
                <Field field="lambda_per_v" errors={shownErrors} hint="self-bias only; 0 when blank">
                  <input {...input('lambda_per_v')} placeholder="0" />
                </Field>
              </div>
            )}
            {form.source === 'part' && (
              <Field
                field="serial"
                errors={shownErrors}
                hint={stored && stored.serial === normalizeSerial(form.serial) ? `IDSS ${formatQuantity(stored.idssA, 'A', 3)}, VP ${v(stored.vpV, 3)}: the bias and drive levels start from these` : storedNote ?? 'uses the part’s current fit'}
              >
                <input {...input('serial', { inputMode: undefined, autoComplete: 'off' })} />
              </Field>
            )}
            {form.source === 'set' && (
              <Field field="set_ref" errors={shownErrors} hint="a reservation id, or serials separated by spaces or commas; each part is estimated from its current fit">
                <textarea {...input('set_ref', { inputMode: undefined, rows: 2 })} />
              </Field>
            )}
            <h2 className="pt-2">2 · Operating point (self-bias)</h2>
            <div className="grid gap-3 sm:grid-cols-2">
              <Field field="target_ma" errors={shownErrors} hint={figures ? 'starts at a quarter of the part’s IDSS; gives the source resistor that sets it' : 'gives the source resistor that sets it'}>
                <input {...input('target_ma')} />
              </Field>
              <Field field="rs_ohm" errors={shownErrors} hint="gives the current it sets">
                <input {...input('rs_ohm')} />
              </Field>
              <Field field="vds_v" errors={shownErrors}>
                <input {...input('vds_v')} />
              </Field>
              <Field field="rd_ohm" errors={shownErrors} hint="for the voltage gain">
                <input {...input('rd_ohm')} />
              </Field>
            </div>
          </section>
          <section className="card space-y-3" aria-label="Mixer">
            <div className="flex items-center justify-between gap-2">
              <h2>3 · Square-law mixer</h2>
              <label className="flex items-center gap-1.5 text-sm">
                <input type="checkbox" checked={form.mixer} onChange={(e) => set({ mixer: e.target.checked })} /> estimate the mixer
              </label>
            </div>
            {form.mixer && (
              <>
                <div className="grid gap-3 sm:grid-cols-[auto_1fr] items-end">
                  <fieldset className="text-sm">
                    <legend className="field">{FIELD_LABELS.bias_mode}</legend>
                    <label className="mr-3 block whitespace-nowrap sm:inline">
                      <input type="radio" name="bias" checked={form.bias_mode === 'half_vp'} onChange={() => set({ bias_mode: 'half_vp' })} /> VP/2 of the part
                    </label>
                    <label className="mr-3 block whitespace-nowrap sm:inline">
                      <input type="radio" name="bias" checked={form.bias_mode === 'vgs0'} onChange={() => set({ bias_mode: 'vgs0' })} /> a fixed VGS0
                    </label>
                    <label className="block whitespace-nowrap sm:inline">
                      <input type="radio" name="bias" checked={form.bias_mode === 'rs'} onChange={() => set({ bias_mode: 'rs' })} /> source resistor
                    </label>
                  </fieldset>
                  {form.bias_mode === 'half_vp' ? (
                    <p className="text-sm text-ink-soft" data-testid="half-vp-bias">
                      {figures
                        ? `VGS0 ${v(estimateDefaultsForPart(figures).vgs0V, 3)}: half of this part's VP, a quarter of its IDSS (square law).`
                        : form.source === 'set'
                          ? 'Each part of the set at half its own VP, a quarter of its IDSS (square law).'
                          : 'Half of the part’s VP, a quarter of its IDSS (square law), once the part is known.'}
                    </p>
                  ) : form.bias_mode === 'vgs0' ? (
                    <Field field="vgs0_v" errors={shownErrors} hint={figures ? `this part: between ${v(figures.vpV, 3)} (VP) and 0 V` : 'between VP and 0 V'}>
                      <input {...input('vgs0_v')} />
                    </Field>
                  ) : (
                    <Field field="mixer_rs_ohm" errors={shownErrors}>
                      <input {...input('mixer_rs_ohm')} />
                    </Field>
                  )}
                </div>
                {drive('lo')}
                {drive('rf')}
                <div className="grid gap-3 sm:grid-cols-2">
                  <Field field="load_ohm" errors={shownErrors}>
                    <input {...input('load_ohm')} />
                  </Field>
                  <Field field="probe_pf" errors={shownErrors} hint="in parallel with R">
                    <input {...input('probe_pf')} placeholder="0" />
                  </Field>
                </div>
              </>
            )}
          </section>
        </div>
        <div className="flex flex-wrap items-center gap-3">
          <button className="btn-primary" type="submit" disabled={busy}>
            {busy ? 'Estimating…' : 'Estimate'}
          </button>
          <span className="text-sm text-ink-faint">Levels you measured can be typed into the results to see the difference; they stay in this page.</span>
        </div>
        {formMessage && (
          <p className="notice-error" role="alert">
            {formMessage}
          </p>
        )}
      </form>

      {outcomes.length === 0 && !formMessage && <Empty>Fill in the inputs and press Estimate.</Empty>}
      {setResult && <MatchedSetCard result={setResult} />}
      {outcomes.map((o) => (
        <PartCard key={o.key} o={o} />
      ))}
    </div>
  );
}

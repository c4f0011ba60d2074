import { useState, type FormEvent } from 'react';
import type { MatchableType, ProposalView, ProposedSet } from '~/contracts/match';
import { ApiError, apiFetch } from '../ui/api-client';
import { useMatchableTypes } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';
import { COMMON_PRACTICE_GRADES, proposalVerdict, setGradeWarnings, toleranceWarnings, type AskedTolerances } from '~/core/match/grade-warnings';
import { idssInDatasheetSign } from '~/core/units/datasheet-sign';
import { columnFormat } from '~/core/units/format-quantity';
import { SHAPE_WORDS, millivolts, percent, roleLabel, volts } from './figures';

type Shape = ProposalView['shape'];
type OpKind = ProposalView['operating_point']['kind'];

interface FormState {
  deviceType: string;
  shape: Shape;
  count: string;
  opKind: OpKind;
  idMa: string;
  vdsV: string;
  rsOhm: string;
  dvgsMv: string;
  gmPct: string;
  idssPct: string;
  marginV: string;
  sameLot: boolean;
  temperatureC: string;
  bins: string[];
  purpose: string;
}

const INITIAL: FormState = {
  deviceType: '',
  shape: 'pair',
  count: '5',
  opKind: 'current',
  idMa: '1',
  vdsV: '10',
  rsOhm: '1000',
  // Common-practice grades (see core/match/grade-warnings.ts).
  dvgsMv: String(COMMON_PRACTICE_GRADES.maxDvgsV * 1e3),
  gmPct: String(Math.round(COMMON_PRACTICE_GRADES.maxGmMismatch * 1000) / 10),
  idssPct: String(Math.round(COMMON_PRACTICE_GRADES.maxIdssMismatch * 1000) / 10),
  marginV: '0.5',
  sameLot: false,
  temperatureC: '25',
  bins: [],
  purpose: '',
};

const num = (s: string) => (s.trim() === '' ? null : Number(s));

function requestBody(f: FormState) {
  const cascode = f.shape === 'cascode_pair' || f.shape === 'matched_cascode_pairs';
  const dvgs = num(f.dvgsMv);
  const gm = num(f.gmPct);
  const idss = num(f.idssPct);
  return {
    device_type: f.deviceType,
    shape: f.shape,
    count: Number(f.count),
    operating_point: f.opKind,
    ...(f.opKind === 'current' ? { id_a: Number(f.idMa) / 1e3 } : {}),
    vds_v: Number(f.vdsV),
    ...(f.opKind === 'self_bias' ? { rs_ohm: Number(f.rsOhm) } : {}),
    max_dvgs_v: dvgs === null ? null : dvgs / 1e3,
    max_gm_mismatch: gm === null ? null : gm / 100,
    max_idss_mismatch: idss === null ? null : idss / 100,
    ...(cascode ? { cascode_margin_v: num(f.marginV) ?? 0 } : {}),
    same_lot: f.sameLot,
    temperature_c: num(f.temperatureC) ?? 25,
    ...(f.bins.length ? { bins: f.bins } : {}),
  };
}

function askedTolerances(f: FormState): AskedTolerances {
  const dvgs = num(f.dvgsMv);
  const gm = num(f.gmPct);
  const idss = num(f.idssPct);
  return { maxDvgsV: dvgs === null ? null : dvgs / 1e3, maxGmMismatch: gm === null ? null : gm / 100, maxIdssMismatch: idss === null ? null : idss / 100 };
}

const VERDICT: Record<ReturnType<typeof proposalVerdict>, { text: string; tag: string }> = {
  best_possible: { text: 'best possible', tag: 'tag-ok' },
  not_proven_best: { text: 'good, not proven best', tag: 'tag-review' },
  outside_common_practice: { text: 'outside common-practice grades', tag: 'tag-fault' },
  none_found: { text: 'none found', tag: 'tag-plain' },
};

function Field({ id, label, unit, hint, children }: { id: string; label: string; unit?: string; hint?: string; children: React.ReactNode }) {
  return (
    <div>
      <label className="field" htmlFor={id}>
        {label}
        {unit && <span className="font-normal text-ink-faint"> ({unit})</span>}
      </label>
      {children}
      {hint && <p className="mt-1 text-xs text-ink-faint">{hint}</p>}
    </div>
  );
}

function Within({ value, limit, show }: { value: number; limit: number | null; show: (x: number) => string }) {
  if (limit === null) return <span className="text-ink-faint">{show(value)}</span>;
  const ok = value <= limit * (1 + 1e-12);
  return (
    <span className={ok ? 'tag-ok' : 'tag-fault'} title={`tolerance ${show(limit)}`}>
      {show(value)} <span className="font-normal">of {show(limit)}</span>
    </span>
  );
}

function SetCard({ set, proposal }: { set: ProposedSet; proposal: ProposalView }) {
  const t = proposal.tolerances;
  const cascode = proposal.shape === 'cascode_pair' || proposal.shape === 'matched_cascode_pairs';
  const matched = proposal.shape !== 'cascode_pair';
  const base = `/api/match/proposals/${proposal.id}/sets/${set.index + 1}`;
  const channel = proposal.device_type.channel;
  const idssOf = (a: number) => idssInDatasheetSign(a, channel);
  // One unit per column, chosen over the set's parts.
  const col = {
    id: columnFormat(set.parts.map((p) => p.id_a), 'A', 3),
    vds: columnFormat(set.parts.map((p) => p.vds_v), 'V', 3),
    vgs: columnFormat(set.parts.map((p) => p.vgs_v), 'V', 4, 1e-4),
    gm: columnFormat(set.parts.map((p) => p.gm_s), 'S', 3),
    idss: columnFormat(set.parts.map((p) => idssOf(p.idss_a)), 'A', 3),
  };
  const outside = matched ? setGradeWarnings({ dvgsV: set.dvgs_v, gmMismatch: set.gm_mismatch, idssMismatch: set.idss_mismatch }) : [];
  return (
    <article className="card p-4" aria-label={`Set ${set.index + 1}`}>
      <header className="flex flex-wrap items-baseline gap-x-4 gap-y-1 mb-3">
        <h3 className="text-base">Set {set.index + 1}</h3>
        {matched && (
          <>
            <span className="text-sm" data-testid="set-dvgs">
              |ΔVGS| <Within value={set.dvgs_v} limit={t.max_dvgs_v} show={(x) => millivolts(x)} />
              {set.dvgs_sigma_v !== undefined && (
                <span className="text-ink-soft"> ± {millivolts(set.dvgs_sigma_v)} (1σ)</span>
              )}
            </span>
            <span className="text-sm">gm <Within value={set.gm_mismatch} limit={t.max_gm_mismatch} show={(x) => percent(x, 2)} /></span>
            <span className="text-sm">IDSS <Within value={set.idss_mismatch} limit={t.max_idss_mismatch} show={(x) => percent(x, 2)} /></span>
          </>
        )}
        {set.cascode_headroom_v !== undefined && (
          <span className="text-sm">
            saturation headroom{' '}
            <span className={set.cascode_headroom_v >= (t.cascode_margin_v ?? 0) - 1e-12 ? 'tag-ok' : 'tag-fault'}>
              {volts(set.cascode_headroom_v, 2)} <span className="font-normal">≥ margin {volts(t.cascode_margin_v ?? 0, 2)}</span>
            </span>
          </span>
        )}
        <span className="ml-auto text-xs">
          <a href={`${base}/model-cards`}>.model cards</a> · <a href={`${base}/figures.csv`}>CSV</a>
        </span>
      </header>
      {matched && set.dvgs_sigma_v !== undefined && t.max_dvgs_v !== null && (
        <p className="mb-2 text-xs text-ink-faint">
          Counted against the |ΔVGS| limit: ΔVGS + {proposal.dvgs_guard_sigmas ?? 2}σ = {millivolts(set.dvgs_v + (proposal.dvgs_guard_sigmas ?? 2) * set.dvgs_sigma_v)}
          {' '}at {proposal.temperature_c ?? 25} °C{set.parts.some((p) => p.temperature_shift_v) ? ' (parts measured at other temperatures corrected)' : ''}.
        </p>
      )}
      {outside.length > 0 && (
        <p className="notice-caution mb-3 text-sm" role="note" data-testid="set-grade-warning">
          Outside common-practice grades: {outside.map((w) => w.message).join('; ')}.
        </p>
      )}
      <div className="overflow-x-auto">
        <table className="table-plain">
          <thead>
            <tr>
              <th>Serial</th>
              <th>Role</th>
              <th>Bin</th>
              <th>Location</th>
              <th className="num !text-right">|ID| ({col.id.unit})</th>
              {cascode && <th className="num !text-right">|VDS| ({col.vds.unit})</th>}
              <th className="num !text-right">VGS ({col.vgs.unit})</th>
              <th className="num !text-right">± 1σ</th>
              <th className="num !text-right">gm ({col.gm.unit})</th>
              <th className="num !text-right">IDSS ({col.idss.unit})</th>
              <th>From</th>
              <th>Lot</th>
            </tr>
          </thead>
          <tbody>
            {set.parts.map((p) => (
              <tr key={p.serial}>
                <td className="font-mono whitespace-nowrap">{p.serial}</td>
                <td>{roleLabel(p.role, p.cascode_index)}</td>
                <td>{p.bin_code ?? '—'}</td>
                <td>{p.location ?? <span className="text-ink-faint">not recorded</span>}</td>
                <td className="num">{col.id.number(p.id_a)}</td>
                {cascode && <td className="num">{col.vds.number(p.vds_v)}</td>}
                <td className="num" data-testid={`vgs-${p.serial}`} data-value={p.vgs_v}>{col.vgs.number(p.vgs_v)}</td>
                <td className="num">{p.vgs_sigma_v ? millivolts(p.vgs_sigma_v) : '—'}</td>
                <td className="num" data-testid={`gm-${p.serial}`} data-value={p.gm_s}>{col.gm.number(p.gm_s)}</td>
                <td className="num">{col.idss.number(idssOf(p.idss_a))}</td>
                <td>{p.source === 'measured' ? 'measurements' : <span className="tag-review" title="outside this part's measurements: from its fitted model">model</span>}</td>
                <td>{p.lot ?? '—'}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </article>
  );
}

function Looser({ p }: { p: ProposalView }) {
  const l = p.looser;
  const found = p.sets.length;
  const cascode = p.shape.includes('cascode');
  const rows: [string, number][] = [
    ['every tolerance 1.5× looser', l.all_times_1_5],
    ['every tolerance 2× looser', l.all_times_2],
    ...(p.tolerances.max_dvgs_v !== null ? ([['only |ΔVGS| doubled', l.only_one_times_2.max_dvgs_v]] as [string, number][]) : []),
    ...(p.tolerances.max_gm_mismatch !== null ? ([['only gm mismatch doubled', l.only_one_times_2.max_gm_mismatch]] as [string, number][]) : []),
    ...(p.tolerances.max_idss_mismatch !== null ? ([['only IDSS mismatch doubled', l.only_one_times_2.max_idss_mismatch]] as [string, number][]) : []),
    ...(cascode ? ([['only the cascode margin halved', l.only_one_times_2.cascode_margin_v]] as [string, number][]) : []),
  ];
  return (
    <div className="card p-4">
      <h3 className="text-base mb-2">With looser tolerances</h3>
      <p className="text-sm text-ink-soft mb-2">
        {found >= p.count_requested
          ? 'The stock already gives every set you asked for; these counts are capped at that number.'
          : `How many sets (up to ${p.count_requested}) the same stock would give:`}
      </p>
      <table className="table-plain max-w-md" aria-label="Sets with looser tolerances">
        <tbody>
          {rows.map(([label, n]) => (
            <tr key={label}>
              <td>{label}</td>
              <td className="num">
                {n} {n > found && <span className="tag-ok">+{n - found}</span>}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export default function MatchRequest() {
  const types = useMatchableTypes();
  const [form, setForm] = useState<FormState>(INITIAL);
  const [busy, setBusy] = useState(false);
  const [proposal, setProposal] = useState<ProposalView>();
  const [error, setError] = useState<Error>();
  const [taken, setTaken] = useState<{ serial: string; reason: string }[]>();
  const set = <K extends keyof FormState>(k: K, v: FormState[K]) => setForm((f) => ({ ...f, [k]: v }));

  const list = types.data?.device_types ?? [];
  const selected = list.find((t) => t.name === form.deviceType) ?? list[0];
  const cascode = form.shape === 'cascode_pair' || form.shape === 'matched_cascode_pairs';
  const formWarnings = form.shape === 'cascode_pair' ? [] : toleranceWarnings(askedTolerances(form));

  async function propose(e?: FormEvent) {
    e?.preventDefault();
    setBusy(true);
    setError(undefined);
    setTaken(undefined);
    try {
      const body = requestBody({ ...form, deviceType: form.deviceType || selected?.name || '' });
      setProposal(await apiFetch<ProposalView>('/api/match/proposals', { method: 'POST', json: body }));
    } catch (err) {
      setProposal(undefined);
      setError(err as Error);
    } finally {
      setBusy(false);
    }
  }

  async function confirm() {
    if (!proposal) return;
    setBusy(true);
    setError(undefined);
    try {
      const out = await apiFetch<{ reservation: { id: string } }>(`/api/match/proposals/${proposal.id}/confirm`, {
        method: 'POST',
        json: form.purpose.trim() ? { purpose: form.purpose.trim() } : {},
      });
      window.location.assign(`/reservations/${out.reservation.id}?new=1`);
    } catch (err) {
      setError(err as Error);
      if (err instanceof ApiError && Array.isArray(err.body?.error.taken)) setTaken(err.body!.error.taken as { serial: string; reason: string }[]);
      setBusy(false);
    }
  }

  if (types.loading && !types.data) return <Loading what="device types" />;
  if (types.error) return <ErrorNotice error={types.error} retry={types.reload} />;
  if (list.length === 0) return <Empty>No device types yet: an administrator adds them first.</Empty>;

  const words = SHAPE_WORDS[proposal?.shape ?? form.shape]!;
  const verdict = proposal
    ? VERDICT[
        proposalVerdict({
          exact: proposal.guarantee.kind === 'exact',
          matched: proposal.shape !== 'cascode_pair',
          tolerances: {
            maxDvgsV: proposal.tolerances.max_dvgs_v,
            maxGmMismatch: proposal.tolerances.max_gm_mismatch,
            maxIdssMismatch: proposal.tolerances.max_idss_mismatch,
          },
          sets: proposal.sets.map((s) => ({ dvgsV: s.dvgs_v, gmMismatch: s.gm_mismatch, idssMismatch: s.idss_mismatch })),
        })
      ]
    : VERDICT.none_found;
  return (
    <div className="space-y-6">
      <form onSubmit={propose} className="card space-y-5" aria-label="Match request">
        <div className="grid gap-4 md:grid-cols-3">
          <Field id="m-type" label="Device type" hint={selected ? `${selected.in_stock} in stock · ${selected.channel.toUpperCase()}-channel` : undefined}>
            <select id="m-type" className="input" value={selected?.name ?? ''} onChange={(e) => setForm((f) => ({ ...f, deviceType: e.target.value, bins: [] }))}>
              {list.map((t) => (
                <option key={t.id} value={t.name}>
                  {t.name} ({t.in_stock} in stock)
                </option>
              ))}
            </select>
          </Field>
          <Field id="m-shape" label="Shape">
            <select id="m-shape" className="input" value={form.shape} onChange={(e) => set('shape', e.target.value as Shape)}>
              <option value="pair">Matched pair (2 parts)</option>
              <option value="quad">Matched quad (4 parts)</option>
              <option value="cascode_pair">Cascode: lower + upper</option>
              <option value="matched_cascode_pairs">Two cascodes, lowers matched (4 parts)</option>
            </select>
          </Field>
          <Field id="m-count" label="How many sets">
            <input id="m-count" className="input" type="number" min={1} max={500} step={1} required value={form.count} onChange={(e) => set('count', e.target.value)} />
          </Field>
        </div>

        <fieldset>
          <legend className="field">Operating point</legend>
          <div className="flex flex-wrap gap-4 text-sm mb-3">
            {(
              [
                ['current', 'At a drain current'],
                ['idss', 'At VGS = 0 (match on IDSS)'],
                ['self_bias', 'Self-bias source resistor'],
              ] as [OpKind, string][]
            ).map(([k, label]) => (
              <label key={k} className="flex items-center gap-1.5">
                <input type="radio" name="op" value={k} checked={form.opKind === k} disabled={cascode && k !== 'current'} onChange={() => set('opKind', k)} />
                {label}
              </label>
            ))}
          </div>
          <div className="grid gap-4 md:grid-cols-3">
            {form.opKind === 'current' && (
              <Field id="m-id" label="Drain current ID" unit="mA" hint="magnitude; a P-channel part runs at −ID">
                <input id="m-id" className="input" type="number" step="any" min={0} required value={form.idMa} onChange={(e) => set('idMa', e.target.value)} />
              </Field>
            )}
            {form.opKind === 'self_bias' && (
              <Field id="m-rs" label="Source resistor RS" unit="Ω" hint="gate to ground, RS from source to ground">
                <input id="m-rs" className="input" type="number" step="any" min={0} required value={form.rsOhm} onChange={(e) => set('rsOhm', e.target.value)} />
              </Field>
            )}
            <Field id="m-vds" label={cascode ? 'VDS of the upper part' : 'Drain–source voltage VDS'} unit="V" hint="magnitude">
              <input id="m-vds" className="input" type="number" step="any" min={0} required value={form.vdsV} onChange={(e) => set('vdsV', e.target.value)} />
            </Field>
          </div>
          {cascode && form.opKind !== 'current' && <p className="notice-caution mt-2">A cascode shares one drain current: choose “At a drain current”.</p>}
        </fieldset>

        <fieldset>
          <legend className="field">Tolerances</legend>
          <p className="mb-3 text-xs text-ink-soft" data-testid="common-practice-grades">
            Starts at common-practice grades for matched duals: |ΔVGS| ≤ {COMMON_PRACTICE_GRADES.maxDvgsV * 1e3} mV at the operating current, IDSS ratio ≥{' '}
            {(1 - COMMON_PRACTICE_GRADES.maxIdssMismatch).toFixed(2)}, gfs ratio ≥ {(1 - COMMON_PRACTICE_GRADES.maxGmMismatch).toFixed(2)}. Tighten them for a better grade;
            an empty field means no limit.
          </p>
          <div className="grid gap-4 md:grid-cols-4">
            {form.shape !== 'cascode_pair' && (
              <>
                <Field id="m-dvgs" label="Largest |ΔVGS|" unit="mV" hint="at the operating current">
                  <input id="m-dvgs" className="input" type="number" step="any" min={0} value={form.dvgsMv} onChange={(e) => set('dvgsMv', e.target.value)} />
                </Field>
                <Field id="m-gm" label="Largest gm mismatch" unit="%" hint="3 % is a gfs ratio ≥ 0.97">
                  <input id="m-gm" className="input" type="number" step="any" min={0} max={100} value={form.gmPct} onChange={(e) => set('gmPct', e.target.value)} />
                </Field>
                <Field id="m-idss" label="Largest IDSS mismatch" unit="%" hint="5 % is an IDSS ratio ≥ 0.95">
                  <input id="m-idss" className="input" type="number" step="any" min={0} max={100} value={form.idssPct} onChange={(e) => set('idssPct', e.target.value)} />
                </Field>
              </>
            )}
            <Field id="m-temp" label="Compare at" unit="°C" hint="each part is corrected from its sweep's temperature">
              <input id="m-temp" className="input" type="number" step="any" min={-60} max={200} value={form.temperatureC} onChange={(e) => set('temperatureC', e.target.value)} />
            </Field>
            {cascode && (
              <Field id="m-margin" label="Cascode margin" unit="V" hint="how far the lower part stays above VDS(sat)">
                <input id="m-margin" className="input" type="number" step="any" min={0} value={form.marginV} onChange={(e) => set('marginV', e.target.value)} />
              </Field>
            )}
          </div>
          {formWarnings.length > 0 && (
            <div className="notice-caution mt-3 text-sm" role="note" data-testid="tolerance-warnings">
              <ul className="list-disc pl-5">
                {formWarnings.map((w) => (
                  <li key={w.figure}>{w.message}</li>
                ))}
              </ul>
            </div>
          )}
        </fieldset>

        <div className="grid gap-4 md:grid-cols-[auto_1fr] items-start">
          <label className="flex items-center gap-2 text-sm mt-2">
            <input type="checkbox" checked={form.sameLot} onChange={(e) => set('sameLot', e.target.checked)} />
            Each set from one lot
          </label>
          <details className="rounded border border-paper-line bg-paper px-3 py-2">
            <summary className="cursor-pointer text-sm font-semibold text-ink-soft">
              Draw from bins:{' '}
              <span className="font-normal">{form.bins.length ? form.bins.join(', ') : 'every bin'}</span>
            </summary>
            {selected && selected.bins.length > 0 ? (
              <div className="mt-2">
                <div className="flex flex-wrap gap-x-4 gap-y-1 text-sm max-h-48 overflow-y-auto">
                  {selected.bins
                    .filter((b) => b.in_stock > 0 || form.bins.includes(b.code))
                    .map((b) => (
                      <label key={b.code} className="flex items-center gap-1.5" title={b.label}>
                        <input
                          type="checkbox"
                          checked={form.bins.includes(b.code)}
                          onChange={(e) => set('bins', e.target.checked ? [...form.bins, b.code] : form.bins.filter((c) => c !== b.code))}
                        />
                        <span className="font-mono">{b.code}</span> <span className="text-ink-faint">({b.in_stock})</span>
                      </label>
                    ))}
                </div>
                <p className="mt-1 text-xs text-ink-faint">
                  Bins with parts in stock (count in brackets); {selected.bins.filter((b) => b.in_stock === 0).length} empty bins not shown. None ticked: every bin.
                </p>
              </div>
            ) : (
              <p className="mt-1 text-sm text-ink-faint">This type has no active bin plan; every in-stock part is a candidate.</p>
            )}
          </details>
        </div>
        <div className="flex items-center gap-3">
          <button className="btn-primary" type="submit" disabled={busy}>
            {busy && !proposal ? 'Searching stock…' : 'Propose sets'}
          </button>
          <span className="text-xs text-ink-faint">Nothing is reserved until you confirm.</span>
        </div>
      </form>

      {error && (
        <div className="notice-error" role="alert">
          <p>{error.message}</p>
          {taken && (
            <>
              <ul className="list-disc ml-5 my-2">
                {taken.map((t) => (
                  <li key={t.serial}>
                    <span className="font-mono">{t.serial}</span>: {t.reason}
                  </li>
                ))}
              </ul>
              <button type="button" className="btn-quiet" onClick={() => void propose()}>
                Ask again with the same request
              </button>
            </>
          )}
        </div>
      )}

      {proposal && (
        <section aria-label="Proposed sets" className="space-y-4">
          <div className="flex flex-wrap items-baseline gap-3">
            <h2>
              {proposal.sets.length} of {proposal.count_requested} {proposal.count_requested === 1 ? words.one : words.many}
            </h2>
            <span className={verdict.tag} title={proposal.guarantee.note} data-testid="proposal-verdict">
              {verdict.text}
            </span>
            <span className="text-sm text-ink-soft">
              from {proposal.candidates.considered} in-stock {proposal.device_type.name}
              {Object.values(proposal.candidates.unusable).reduce((a, b) => a + b, 0) > 0 &&
                `, ${Object.values(proposal.candidates.unusable).reduce((a, b) => a + b, 0)} of them cannot run at this point`}
              {proposal.server_ms !== undefined && ` · ${proposal.server_ms} ms`}
            </span>
          </div>
          <p className="text-sm text-ink-soft">{proposal.guarantee.note}.</p>
          {verdict === VERDICT.outside_common_practice && (
            <p className="notice-caution text-sm" role="note">
              Not called best possible: {toleranceWarnings({ maxDvgsV: proposal.tolerances.max_dvgs_v, maxGmMismatch: proposal.tolerances.max_gm_mismatch, maxIdssMismatch: proposal.tolerances.max_idss_mismatch }).length > 0
                ? 'the request left a tolerance empty or looser than common practice'
                : 'a set falls outside the common-practice grades'}
              ; check the warnings on each set before you reserve.
            </p>
          )}
          {proposal.sets.length === 0 ? (
            <Empty>No set in stock meets these tolerances at this operating point. The counts below show which tolerance to loosen.</Empty>
          ) : (
            <div className="space-y-3">
              {proposal.sets.map((s) => (
                <SetCard key={s.index} set={s} proposal={proposal} />
              ))}
            </div>
          )}
          <Looser p={proposal} />
          {proposal.sets.length > 0 && (
            <div className="card p-4 flex flex-wrap items-end gap-4">
              <div className="flex-1 min-w-[16rem]">
                <label className="field" htmlFor="m-purpose">For (optional note to stores)</label>
                <input id="m-purpose" className="input" maxLength={300} placeholder="e.g. phono stage prototype, board 3" value={form.purpose} onChange={(e) => set('purpose', e.target.value)} />
              </div>
              <button type="button" className="btn-primary" disabled={busy} onClick={() => void confirm()}>
                {busy ? 'Reserving…' : `Reserve all ${proposal.sets.reduce((n, s) => n + s.parts.length, 0)} parts`}
              </button>
            </div>
          )}
        </section>
      )}
    </div>
  );
}

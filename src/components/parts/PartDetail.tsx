import { useMemo, useState } from 'react';
import CurveFamilyChart from '../charts/CurveFamilyChart';
import ResidualsChart from '../charts/ResidualsChart';
import { pointKey } from '../charts/chart-data';
import AuditTrail from '../audit/AuditTrail';
import OperatingFiguresPanel from './OperatingFiguresPanel';
import ReviewActions from '../review/ReviewActions';
import { usePart } from '../api';
import { ErrorNotice, Loading } from '../ui/states';
import { idssInDatasheetSign, vdsInDatasheetSign } from '~/core/units/datasheet-sign';
import { formatMeasuredNumber, formatSignificant } from '~/core/units/format-quantity';
import { measured, percent, plain, q, when } from './figures';
import type { FitStandardErrorsJson } from '~/contracts/parts';
import { flagWord, STATUS_WORDS, statusClass, type PartJson } from './part-types';

/** Flat fitter indices of flag-excluded points → "curve:point" keys. */
function flagExcludedKeys(part: PartJson): Set<string> {
  const keys = new Set<string>();
  const curves = part.current_sweep?.curves ?? [];
  for (const f of part.flag_details) {
    for (const flat of f.excluded_points ?? []) {
      let rest = flat;
      for (let ci = 0; ci < curves.length; ci++) {
        if (rest < curves[ci].vds_v.length) {
          keys.add(pointKey(ci, rest));
          break;
        }
        rest -= curves[ci].vds_v.length;
      }
    }
  }
  return keys;
}

function ParameterTable({ part }: { part: PartJson }) {
  const se: Partial<FitStandardErrorsJson> = part.standard_errors ?? {};
  const vds = part.idss_vds_v;
  // Datasheet signs: a P-channel part's IDSS is negative and its VDS too.
  const idss = (a: number | null) => (a === null ? null : idssInDatasheetSign(a, part.channel));
  const vdsText = vds === null ? 'the test VDS' : `VDS = ${formatSignificant(vdsInDatasheetSign(vds, part.channel), 'V', 3)}`;
  const pSign = part.channel === 'p' ? ' (datasheet sign: negative for P)' : '';
  const bare = (value: number | null, err: number | null | undefined, scale: number, unit: string): [string, string] => {
    if (value === null) return ['—', ''];
    const [v, e] = formatMeasuredNumber(value * scale, err === null || err === undefined ? null : err * scale);
    return [`${v} ${unit}`, e ? `± ${e} ${unit}` : ''];
  };
  const row = (name: string, cells: [string, string], note: string): [string, string, string, string] => [name, cells[0], cells[1], note];
  const rows: [string, string, string, string][] = [
    row('VTO', measured(part.vto_v, se.vto_v, 'V'), 'threshold, N-equivalent sign (negative for NJF and PJF)'),
    row('BETA', bare(part.beta_a_per_v2, se.beta_a_per_v2, 1e3, 'mA/V²'), 'transconductance parameter'),
    row('LAMBDA', bare(part.lambda_per_v, se.lambda_per_v, 1, '/V'), 'channel-length modulation'),
    row('RS', measured(part.rs_ohm, se.rs_ohm, 'Ω'), part.model === 'level1+rs_rd' ? 'source resistance (extended fit kept)' : 'not fitted (level-1 model kept)'),
    row('RD', measured(part.rd_ohm, se.rd_ohm, 'Ω'), part.model === 'level1+rs_rd' ? 'drain resistance (extended fit kept)' : 'not fitted (level-1 model kept)'),
    row(`IDSS at ${vdsText}`, measured(idss(part.idss_a), se.idss_a, 'A'), `from the model, VGS = 0${pSign}`),
    row('IDSS measured', measured(idss(part.idss_measured_a), null, 'A'), part.idss_measured_a === null ? 'the sweep does not cover that point' : 'read from the VGS = 0 curve'),
    row('VP (square-law pinch-off)', measured(part.vp_v, se.vp_v, 'V'), 'datasheet sign; an extrapolation, not a VGS(off) at nA'),
    row('gfs at VGS = 0', measured(part.gfs_s, se.gfs_s, 'S'), `at ${vdsText}`),
    row('gos at IDSS', measured(part.gos_s, se.gos_s, 'S'), `at ${vdsText}`),
    row('rDS(on)', measured(part.rds_on_ohm, se.rds_on_ohm, 'Ω'), 'VGS = 0, small VDS'),
    ['RMS residual', `${q(part.rms_a, 'A', 2)} (${percent(part.rms_rel)} of IDSS)`, '', `R² ${part.r_squared === null ? '—' : part.r_squared.toFixed(5)}, ${part.points_fitted ?? '—'} points, ${part.iterations ?? '—'} iterations`],
  ];
  return (
    <table className="table-plain" aria-label="Fitted parameters">
      <thead>
        <tr>
          <th>Figure</th>
          <th className="text-right">Value</th>
          <th className="text-right">Standard error</th>
          <th>Note</th>
        </tr>
      </thead>
      <tbody>
        {rows.map(([name, value, err, note]) => (
          <tr key={name}>
            <td className="font-semibold">{name}</td>
            <td className="num">{value}</td>
            <td className="num text-ink-soft">{err}</td>
            <td className="text-ink-soft">{note}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function ModelCard({ part }: { part: PartJson }) {
  const [copied, setCopied] = useState(false);
  if (!part.model_card) return null;
  const url = `/api/parts/${encodeURIComponent(part.serial)}/model-card`;
  return (
    <section className="card" aria-labelledby="card-heading">
      <h2 id="card-heading" className="mb-2 text-lg">SPICE model card</h2>
      <pre className="whitespace-pre-wrap break-all rounded bg-paper-sunk px-3 py-2 font-mono text-sm" data-testid="model-card">{part.model_card}</pre>
      <div className="mt-3 flex gap-2">
        <button
          type="button"
          className="btn-quiet"
          onClick={() => {
            void navigator.clipboard?.writeText(part.model_card!).then(() => setCopied(true));
          }}
        >
          {copied ? 'Copied' : 'Copy card'}
        </button>
        <a className="btn-quiet no-underline hover:no-underline" href={url} download>
          Download .lib
        </a>
      </div>
      <p className="mt-2 text-xs text-ink-faint">
        Level-1 JFET, {part.channel === 'n' ? 'NJF' : 'PJF'}; VTO stays negative in both. Valid near the measured temperature and bias range only.
      </p>
    </section>
  );
}

export default function PartDetail({ serial, mode = 'view' }: { serial: string; mode?: 'view' | 'review' }) {
  const { data: part, error, loading, reload } = usePart(serial);
  const [pending, setPending] = useState<Set<string> | null>(null);

  const flagged = useMemo(() => (part ? flagExcludedKeys(part) : new Set<string>()), [part]);
  const stored = useMemo(() => new Set((part?.current_sweep?.excluded_points ?? []).map(([c, p]) => pointKey(c, p))), [part]);
  const chosen = pending ?? stored;
  const shownExcluded = useMemo(() => new Set([...chosen, ...flagged]), [chosen, flagged]);

  if (loading && !part) return <Loading what={`part ${serial}`} />;
  if (error) return <ErrorNotice error={error} retry={reload} />;
  if (!part) return null;

  const params =
    part.vto_v !== null
      ? { vtoV: part.vto_v, betaAPerV2: part.beta_a_per_v2!, lambdaPerV: part.lambda_per_v!, rsOhm: part.rs_ohm ?? 0, rdOhm: part.rd_ohm ?? 0 }
      : null;
  const toggle = (c: number, p: number) => {
    const next = new Set(chosen);
    const k = pointKey(c, p);
    if (next.has(k)) next.delete(k);
    else next.add(k);
    setPending(next);
  };
  const setPoints = (points: [number, number][], leaveOut: boolean) => {
    const next = new Set(chosen);
    for (const [c, p] of points) {
      if (leaveOut) next.add(pointKey(c, p));
      else next.delete(pointKey(c, p));
    }
    setPending(next);
  };

  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-baseline gap-x-4 gap-y-1">
        <h1 className="font-mono" data-testid="part-serial">{part.serial}</h1>
        <span className={statusClass(part.status)} data-testid="part-status">{STATUS_WORDS[part.status] ?? part.status}</span>
        <span className="text-ink-soft">
          {part.device_type} · {part.channel.toUpperCase()}-channel{part.lot ? ` · lot ${part.lot}` : ''}
          {part.bin_code ? ` · bin ${part.bin_code}${part.bin_label ? ` (${part.bin_label})` : ''}` : ' · no bin'}
          {part.location ? ` · at ${part.location}` : ''}
        </span>
      </div>

      {part.flag_details.length > 0 && (
        <div className="notice-caution" role="note" aria-label="Fit flags">
          <p className="mb-1 font-semibold">The fitter raised {part.flag_details.length === 1 ? 'a flag' : `${part.flag_details.length} flags`}:</p>
          <ul className="list-disc space-y-1 pl-5">
            {part.flag_details.map((f) => (
              <li key={f.code}>
                <span className="font-semibold">{flagWord(f.code)}</span> — {f.message}
              </li>
            ))}
          </ul>
        </div>
      )}

      {(part.current_sweep?.notes.length ?? 0) > 0 && (
        <div className="notice-info" role="note" aria-label="Intake notes">
          <p className="mb-1 font-semibold">When the sweep file was read:</p>
          <ul className="list-disc space-y-1 pl-5">
            {part.current_sweep!.notes.map((n, i) => (
              <li key={i}>{n.message}</li>
            ))}
          </ul>
        </div>
      )}

      <div className="grid gap-5 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <section className="card" aria-labelledby="curves-heading">
          <div className="mb-2 flex flex-wrap items-baseline justify-between gap-2">
            <h2 id="curves-heading" className="text-lg">Curve family and fitted model</h2>
            {mode === 'review' && <span className="text-xs text-ink-faint">Click a dot, or drag a box round several, to leave them out of the refit; again to put them back. Keyboard: Tab to the chart, arrows, Space.</span>}
          </div>
          {part.current_sweep ? (
            <>
              <CurveFamilyChart
                curves={part.current_sweep.curves}
                channel={part.channel}
                params={params}
                excluded={shownExcluded}
                onTogglePoint={mode === 'review' ? toggle : undefined}
                onSetPoints={mode === 'review' ? setPoints : undefined}
              />
              {params && part.idss_a ? (
                <>
                  <h3 className="mb-1 mt-4 text-sm font-semibold text-ink-soft">Residuals (measured − model)</h3>
                  <ResidualsChart curves={part.current_sweep.curves} channel={part.channel} params={params} idssA={part.idss_a} excluded={shownExcluded} />
                </>
              ) : null}
            </>
          ) : (
            <p className="text-ink-faint">No sweep stored for this part.</p>
          )}
        </section>

        <div className="space-y-5">
          {mode === 'review' && part.fit_id !== null && (
            <ReviewActions
              serial={part.serial}
              fitId={part.fit_id}
              status={part.status}
              excluded={[...chosen].map((k) => k.split(':').map(Number) as [number, number])}
              changed={pending !== null}
              onDone={() => {
                setPending(null);
                reload();
              }}
            />
          )}
          <section className="card" aria-labelledby="conditions-heading">
            <h2 id="conditions-heading" className="mb-2 text-lg">Test conditions</h2>
            {part.test_conditions ? (
              <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
                <dt className="text-ink-soft">Temperature</dt>
                <dd>{part.test_conditions.temperature_c === null ? 'not recorded' : `${plain(part.test_conditions.temperature_c, 1)} °C`}</dd>
                <dt className="text-ink-soft">IDSS test |VDS|</dt>
                <dd>{plain(part.test_conditions.vds_test_v, 1)} V</dd>
                <dt className="text-ink-soft">Station</dt>
                <dd>{part.test_conditions.station ?? '—'}</dd>
                <dt className="text-ink-soft">Operator</dt>
                <dd>{part.test_conditions.operator ?? '—'}</dd>
                <dt className="text-ink-soft">Measured</dt>
                <dd>{when(part.test_conditions.measured_at)}</dd>
                <dt className="text-ink-soft">Fit</dt>
                <dd>
                  {part.model === 'level1+rs_rd' ? 'level 1 with RS, RD' : 'level 1'} · {when(part.fitted_at)}
                  {part.review ? ` · ${part.review.replace('_', ' ')}` : ''}
                </dd>
              </dl>
            ) : (
              <p className="text-ink-faint">No sweep yet.</p>
            )}
          </section>
          <ModelCard part={part} />
        </div>
      </div>

      <section className="card" aria-labelledby="params-heading">
        <h2 id="params-heading" className="mb-2 text-lg">Fitted parameters and data-sheet figures</h2>
        <ParameterTable part={part} />
        {part.extended_test && (
          <p className="mt-2 text-xs text-ink-faint">
            RS/RD test: F = {plain(part.extended_test.f_statistic, 2)}, p = {part.extended_test.p_value === null ? '—' : part.extended_test.p_value.toExponential(2)};
            the extended model is kept when p &lt; 0.01 ({part.extended_test.kept ? 'kept' : 'not kept'}).
          </p>
        )}
      </section>

      {part.operating && <OperatingFiguresPanel serial={part.serial} channel={part.channel} operating={part.operating} />}

      <section className="card" aria-labelledby="history-heading">
        <h2 id="history-heading" className="mb-2 text-lg">Sweeps and retests</h2>
        <table className="table-plain">
          <thead>
            <tr>
              <th>Measured</th>
              <th>File</th>
              <th>Conditions</th>
              <th className="text-right">Points</th>
              <th>Fits</th>
            </tr>
          </thead>
          <tbody>
            {part.sweeps.map((s) => (
              <tr key={s.sweep_id} className={s.is_current ? 'bg-channel-50' : undefined}>
                <td>{when(s.measured_at)}{s.is_current && <span className="tag-plain ml-2">current</span>}</td>
                <td className="font-mono text-xs">{s.file_name ?? '—'}</td>
                <td>
                  {s.temperature_c === null ? '—' : `${plain(s.temperature_c, 1)} °C`}
                  {s.station ? ` · ${s.station}` : ''}
                  {s.operator ? ` · ${s.operator}` : ''}
                </td>
                <td className="num">{s.point_count}</td>
                <td>
                  {s.fits.map((f) => (
                    <div key={f.fit_id} className="text-xs">
                      fit {f.fit_id}: IDSS {formatSignificant(idssInDatasheetSign(f.idss_a, part.channel), 'A', 3)}, VP {formatSignificant(f.vp_v, 'V', 3)}, {f.review.replace('_', ' ')}
                      {f.flags.length ? ` — ${f.flags.map(flagWord).join(', ')}` : ''}
                      {f.is_current ? ' (current)' : ''}
                    </div>
                  ))}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>

      {part.audit && (
        <section className="card" aria-labelledby="audit-heading">
          <h2 id="audit-heading" className="mb-2 text-lg">Audit trail</h2>
          <AuditTrail entries={part.audit} />
        </section>
      )}
    </div>
  );
}

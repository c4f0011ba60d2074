import { Axis, GlyphSeries, Grid, LineSeries, XYChart } from '@visx/xychart';
import { chartTheme } from '../charts/CurveFamilyChart';
import { useState, type FormEvent } from 'react';
import { formatMeasured, formatSignificant } from '~/core/units/format-quantity';
import { ApiError, apiFetch } from '../ui/api-client';
import { useWidth } from '../charts/use-width';
import type { OperatingPointJson, PartOperatingJson } from './part-types';


interface XY {
  x: number;
  y: number;
}

const sourceWords = (s: 'measured' | 'model' | null) =>
  s === 'measured' ? 'read from this part’s measurements' : s === 'model' ? 'from the fitted model (outside the measurements)' : '—';

/**
 * The part's figures where a designer runs it: IDSS at the test VDS, the fitted model's VGS
 * against the measured one (table and transfer chart), and a form that asks the server for VGS,
 * gm and gos at any drain current and VDS — the same figures matching and estimates use.
 */
export default function OperatingFiguresPanel({ serial, channel, operating }: { serial: string; channel: 'n' | 'p'; operating: PartOperatingJson }) {
  const { ref, width } = useWidth<HTMLDivElement>();
  const agreement = operating.model_agreement;
  const measured: XY[] = operating.transfer.measured.map((p) => ({ x: p.vgs_v, y: p.id_a * 1e3 }));
  const model: XY[] = operating.transfer.model.map((p) => ({ x: p.vgs_v, y: p.id_a * 1e3 }));
  const marks: XY[] = (agreement?.points ?? []).flatMap((p) => [
    { x: p.vgs_measured_v, y: p.id_a * 1e3 },
    { x: p.vgs_model_v, y: p.id_a * 1e3 },
  ]);
  const mv = (v: number) => formatSignificant(v, 'V', 4);

  return (
    <section className="card" aria-labelledby="operating-heading">
      <h2 id="operating-heading" className="mb-2 text-lg">Figures at an operating point</h2>
      <p className="text-sm text-ink-soft">
        IDSS at {formatSignificant(Math.abs(operating.idss_vds_v), 'V', 3)}:{' '}
        <strong data-testid="idss-operating">{operating.idss_a === null ? '—' : formatSignificant(operating.idss_a, 'A', 4)}</strong>,{' '}
        {sourceWords(operating.idss_source)}, at {operating.temperature_c} °C
        {operating.measured_at_c !== null && operating.measured_at_c !== operating.temperature_c
          ? ` (measured at ${operating.measured_at_c} °C, corrected with the device type's temperature coefficients)`
          : ''}
        .
      </p>
      {agreement ? (
        <div className="mt-3">
          <h3 className="text-base">Fitted model against the measurements</h3>
          <p className={agreement.flagged ? 'text-sm text-state-fault' : 'text-sm text-ink-soft'} data-testid="model-agreement">
            {agreement.flagged
              ? `The level-1 model puts VGS up to ${mv(agreement.max_disagreement_v)} away from where this part was measured (more than ${mv(agreement.threshold_v)}): the part is not square law. Matching and estimates use the measurements; the .model card is an approximation.`
              : `The level-1 model agrees with the measurements within ${mv(agreement.max_disagreement_v)} (flagged above ${mv(agreement.threshold_v)}).`}
          </p>
          <div className="overflow-x-auto">
            <table className="table-plain mt-2" aria-label="Model and measured VGS">
              <thead>
                <tr>
                  <th>Share of IDSS</th>
                  <th className="num">ID</th>
                  <th className="num">VGS measured</th>
                  <th className="num">VGS from the model</th>
                  <th className="num">Model − measured</th>
                </tr>
              </thead>
              <tbody>
                {agreement.points.map((p) => (
                  <tr key={p.fraction}>
                    <td>{Math.round(p.fraction * 100)} %</td>
                    <td className="num">{formatSignificant(p.id_a, 'A', 3)}</td>
                    <td className="num">{formatMeasured(p.vgs_measured_v, p.vgs_sigma_v, 'V').text}</td>
                    <td className="num">{formatSignificant(p.vgs_model_v, 'V', 4)}</td>
                    <td className="num">{formatSignificant(p.vgs_model_v - p.vgs_measured_v, 'V', 3)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <div ref={ref} className="mt-2" aria-label={`Transfer curve at ${Math.abs(agreement.vds_v)} V: measured gate steps and the fitted model`} role="img">
            {width > 0 && measured.length > 0 && (
              <XYChart height={260} width={width} theme={chartTheme} xScale={{ type: 'linear', zero: false }} yScale={{ type: 'linear', zero: true }}>
                <Grid columns={false} numTicks={5} />
                <Axis orientation="bottom" label={`VGS (V)${channel === 'p' ? ', datasheet sign' : ''}`} numTicks={6} />
                <Axis orientation="left" label="|ID| (mA)" numTicks={5} />
                <LineSeries dataKey="fitted model" data={model} xAccessor={(d) => d.x} yAccessor={(d) => d.y} />
                <GlyphSeries dataKey="measured steps" data={measured} xAccessor={(d) => d.x} yAccessor={(d) => d.y} size={7} colorAccessor={() => '#9a5b13'} />
                <GlyphSeries dataKey="compared points" data={marks} xAccessor={(d) => d.x} yAccessor={(d) => d.y} size={5} colorAccessor={() => '#b42318'} />
              </XYChart>
            )}
          </div>
          <p className="text-xs text-ink-faint">
            Line: the fitted level-1 model; dots: each gate step’s smoothed measured current at {Math.abs(agreement.vds_v)} V; red marks: where the model and the measurements put VGS at the compared currents.
          </p>
        </div>
      ) : (
        <p className="mt-2 text-sm text-ink-faint">The measurements do not reach the points where the model is compared with them.</p>
      )}
      <OperatingPointForm serial={serial} channel={channel} />
    </section>
  );
}

function OperatingPointForm({ serial, channel }: { serial: string; channel: 'n' | 'p' }) {
  const [idMa, setIdMa] = useState('1');
  const [vds, setVds] = useState('10');
  const [temp, setTemp] = useState('25');
  const [result, setResult] = useState<OperatingPointJson | null>(null);
  const [error, setError] = useState<string | null>(null);

  async function ask(e: FormEvent) {
    e.preventDefault();
    setError(null);
    const q = new URLSearchParams({ id_a: String(Number(idMa) / 1e3), vds_v: vds, temperature_c: temp });
    try {
      setResult(await apiFetch<OperatingPointJson>(`/api/parts/${encodeURIComponent(serial)}/operating-point?${q}`));
    } catch (err) {
      setResult(null);
      setError(err instanceof ApiError ? err.message : String(err));
    }
  }

  return (
    <form className="mt-4 flex flex-wrap items-end gap-3" onSubmit={ask} aria-label="Figures at your operating point">
      <label className="flex flex-col text-sm">
        |ID| (mA)
        <input className="input w-24" inputMode="decimal" value={idMa} onChange={(e) => setIdMa(e.target.value)} name="id_ma" />
      </label>
      <label className="flex flex-col text-sm">
        |VDS| (V)
        <input className="input w-24" inputMode="decimal" value={vds} onChange={(e) => setVds(e.target.value)} name="vds_v" />
      </label>
      <label className="flex flex-col text-sm">
        Temperature (°C)
        <input className="input w-24" inputMode="decimal" value={temp} onChange={(e) => setTemp(e.target.value)} name="temperature_c" />
      </label>
      <button className="btn-primary" type="submit">
        Show figures
      </button>
      {error && (
        <p role="alert" className="basis-full text-sm text-state-fault">
          {error}
        </p>
      )}
      {result && (
        <dl className="basis-full grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm" data-testid="operating-point-result">
          <dt>VGS</dt>
          <dd data-testid="op-vgs" data-value={result.vgs_v}>{formatMeasured(result.vgs_v, result.uncertainty_v, 'V').text}</dd>
          <dt>gm</dt>
          <dd data-testid="op-gm" data-value={result.gm_s}>{formatSignificant(result.gm_s, 'S', 4)}</dd>
          <dt>gos</dt>
          <dd>{result.gos_s === null ? '—' : formatSignificant(result.gos_s, 'S', 3)}</dd>
          <dt>From</dt>
          <dd>{sourceWords(result.source)}</dd>
          <dt>Temperature</dt>
          <dd>
            {result.temperature_c} °C
            {result.measured_at_c !== null && result.measured_at_c !== result.temperature_c
              ? ` (measured at ${result.measured_at_c} °C; VGS corrected by ${formatSignificant(result.temperature_shift_v, 'V', 3)})`
              : ''}
          </dd>
          <dt>Model card VGS</dt>
          <dd>{formatSignificant(result.model_vgs_v, 'V', 4)}{channel === 'p' ? ' (datasheet sign)' : ''}</dd>
        </dl>
      )}
    </form>
  );
}

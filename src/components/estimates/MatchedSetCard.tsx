import { formatPercent, formatPlain } from '~/core/units/format-quantity';
import { sig as formatQuantity } from './sig';
import type { MatchedSetEstimateJson } from '~/contracts/estimates';

function mv(x: number) {
  return `${formatPlain(x * 1e3, 2)} mV`;
}

/** Each set's parts at one operating point and what their spread means in two circuits. */
export function MatchedSetCard({ result }: { result: MatchedSetEstimateJson }) {
  const op = result.operating_point;
  return (
    <section className="card space-y-4" aria-label="Matched sets">
      <header>
        <h2>Matched set at {formatQuantity(op.drain_current_a, 'A')}, |VDS| {op.vds_v} V</h2>
        <p className="text-sm text-ink-soft">{result.model}</p>
      </header>
      {result.sets.map((s) => (
        <div key={s.set_index} className="space-y-3">
          {result.sets.length > 1 && <h3>Set {s.set_index + 1}</h3>}
          <div className="overflow-x-auto">
            <table className="table-plain" aria-label={`Parts of set ${s.set_index + 1}`}>
              <thead>
                <tr>
                  <th>Serial</th>
                  <th>Role</th>
                  <th className="num">IDSS</th>
                  <th className="num">VGS at ID</th>
                  <th className="num">gm at ID</th>
                  <th className="num">Source resistor for ID</th>
                  <th className="num">VGS when matched</th>
                </tr>
              </thead>
              <tbody>
                {s.parts.map((p) => (
                  <tr key={p.serial}>
                    <td className="font-mono text-xs">{p.serial}</td>
                    <td>{p.role}</td>
                    {p.operating_point ? (
                      <>
                        <td className="num">{p.idss_a !== null ? formatQuantity(p.idss_a, 'A') : '—'}</td>
                        <td className="num" data-testid={`set-vgs-${p.serial}`} data-value={p.operating_point.vgs_v}>{formatQuantity(p.operating_point.vgs_v, 'V')}</td>
                        <td className="num" data-testid={`set-gm-${p.serial}`} data-value={p.operating_point.gm_s}>{formatQuantity(p.operating_point.gm_s, 'S')}</td>
                        <td className="num">{formatQuantity(p.operating_point.source_resistor_ohm, 'Ω')}</td>
                        <td className="num">{p.matched ? formatQuantity(p.matched.vgs_v, 'V') : '—'}</td>
                      </>
                    ) : (
                      <td colSpan={5} className="text-state-fault">
                        {p.error}
                      </td>
                    )}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {s.pairs.length === 0 ? (
            <p className="notice-caution">No pair of this set could be compared.</p>
          ) : (
            <div className="overflow-x-auto">
              <table className="table-plain" aria-label={`Pairs of set ${s.set_index + 1}`}>
                <thead>
                  <tr>
                    <th>Pair</th>
                    <th className="num">ΔVGS</th>
                    <th className="num">gm mismatch</th>
                    <th className="num">IDSS ratio</th>
                    <th className="num" title="differential pair: input offset voltage">Diff. pair input offset</th>
                    <th className="num" title="gm·ΔVGS with both gates at the same voltage">Drain-current imbalance</th>
                    <th className="num">Output offset across RD</th>
                    <th className="num" title="balanced mixer LO feedthrough relative to a single-ended stage">Balanced-mixer LO leak vs single-ended</th>
                    <th className="num">Residual LO current</th>
                  </tr>
                </thead>
                <tbody>
                  {s.pairs.map((p) => (
                    <tr key={`${p.a}-${p.b}`}>
                      <td className="font-mono text-xs whitespace-nowrap">
                        {p.a} / {p.b}
                      </td>
                      <td className="num">{mv(p.dvgs_v)}</td>
                      <td className="num">{formatPercent(p.gm_mismatch, 2)}</td>
                      <td className="num">{formatPlain(p.idss_ratio, 3)}</td>
                      <td className="num">{mv(p.input_offset_v)}</td>
                      <td className="num">{formatQuantity(p.drain_current_imbalance_a, 'A')}</td>
                      <td className="num">{p.output_offset_v === null ? '—' : mv(p.output_offset_v)}</td>
                      <td className="num">{p.lo_leakage_relative_db === null ? 'none (perfect match)' : `${formatPlain(p.lo_leakage_relative_db, 1)} dB`}</td>
                      <td className="num">{p.lo_leakage_current_a === null ? '—' : formatQuantity(p.lo_leakage_current_a, 'A')}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </div>
      ))}
      <p className="text-xs text-ink-faint">
        Differential pair: at equal drain currents the gates differ by ΔVGS, which is the pair’s input offset; with both gates tied the currents differ by gm·ΔVGS.
        Balanced mixer: the LO common to both parts cancels except for the gm mismatch, leaving mismatch/2 of the LO a single-ended stage would pass (20·log10(mismatch/2) dB), first order
        only. Derived from the square law; equal loads; gos neglected.
      </p>
    </section>
  );
}

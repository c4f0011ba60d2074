import { useState } from 'react';
import { columnFormat, formatPlain } from '~/core/units/format-quantity';

export interface MixerProductRow {
  name: string;
  frequency_hz: number;
  current_a: number;
  load_impedance_ohm: number;
  output_peak_v: number;
  dbv: number | null;
  dbm: number | null;
}

const PRODUCT_LABELS: Record<string, string> = {
  rf: 'RF',
  lo: 'LO',
  lo_minus_rf: 'LO − RF',
  lo_plus_rf: 'LO + RF',
  two_lo: '2·LO',
  two_rf: '2·RF',
};

function db(v: number | null, digits = 2): string {
  return formatPlain(v, digits);
}

/**
 * The estimated products, with a column for the levels the person measured and the difference
 * (measured − estimate, in the unit they chose). Nothing typed here leaves the browser.
 */
export function MixerTable({ rows, partKey }: { rows: MixerProductRow[]; partKey: string }) {
  const [unit, setUnit] = useState<'dbv' | 'dbm'>('dbv');
  const [measured, setMeasured] = useState<Record<string, string>>({});
  // One unit per column over the products.
  const col = {
    f: columnFormat(rows.map((p) => p.frequency_hz), 'Hz', 4),
    i: columnFormat(rows.map((p) => p.current_a), 'A', 4),
    z: columnFormat(rows.map((p) => p.load_impedance_ohm), 'Ω', 4),
    v: columnFormat(rows.map((p) => p.output_peak_v), 'V', 4),
  };
  return (
    <div className="overflow-x-auto">
      <table className="table-plain" aria-label={`Mixer products of ${partKey}`}>
        <thead>
          <tr>
            <th>Product</th>
            <th className="num">Frequency ({col.f.unit})</th>
            <th className="num">Drain current, peak ({col.i.unit})</th>
            <th className="num">|Z| of the load ({col.z.unit})</th>
            <th className="num">Output, peak ({col.v.unit})</th>
            <th className="num">dBV (RMS)</th>
            <th className="num">dBm into R</th>
            <th className="num">
              <label className="inline-flex items-center gap-1">
                Measured
                <select className="rounded border border-paper-line bg-white px-1 py-0 text-xs font-normal" value={unit} onChange={(e) => setUnit(e.target.value as 'dbv' | 'dbm')} aria-label="Unit of the measured levels">
                  <option value="dbv">dBV</option>
                  <option value="dbm">dBm</option>
                </select>
              </label>
            </th>
            <th className="num">Measured − estimate</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((p) => {
            const estimate = unit === 'dbv' ? p.dbv : p.dbm;
            const text = measured[p.name] ?? '';
            const value = Number(text.trim().replace('\u2212', '-').replace(',', '.'));
            const valid = text.trim() !== '' && Number.isFinite(value);
            const diff = valid && estimate !== null ? value - estimate : null;
            const tone = diff === null ? '' : Math.abs(diff) <= 1 ? 'tag-ok' : Math.abs(diff) <= 3 ? 'tag-review' : 'tag-fault';
            return (
              <tr key={p.name}>
                <td className="whitespace-nowrap font-semibold">{PRODUCT_LABELS[p.name] ?? p.name}</td>
                <td className="num">{col.f.number(p.frequency_hz)}</td>
                <td className="num">{col.i.number(p.current_a)}</td>
                <td className="num">{col.z.number(p.load_impedance_ohm)}</td>
                <td className="num">{col.v.number(p.output_peak_v)}</td>
                <td className="num">{db(p.dbv)}</td>
                <td className="num">{db(p.dbm)}</td>
                <td className="num">
                  <input
                    className={`w-24 rounded border bg-white px-1.5 py-0.5 text-right tabular-nums ${text && !valid ? 'border-state-fault' : 'border-paper-line'}`}
                    inputMode="decimal"
                    aria-label={`Measured ${PRODUCT_LABELS[p.name] ?? p.name} of ${partKey} (${unit === 'dbv' ? 'dBV' : 'dBm'})`}
                    aria-invalid={text !== '' && !valid}
                    placeholder={unit === 'dbv' ? 'dBV' : 'dBm'}
                    value={text}
                    onChange={(e) => setMeasured((m) => ({ ...m, [p.name]: e.target.value }))}
                  />
                  {text && !valid && <span className="block text-xs text-state-fault">a number in {unit === 'dbv' ? 'dBV' : 'dBm'}</span>}
                </td>
                <td className="num" data-testid={`difference-${p.name}`}>
                  {diff === null ? '—' : <span className={tone}>{`${diff >= 0 ? '+' : '\u2212'}${Math.abs(diff).toFixed(2)} dB`}</span>}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

import { formatQuantity } from '~/core/units/format-quantity';
import { useBinParts } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';
import type { MapBin } from './bin-grid';

const TAG: Record<string, string> = { in_stock: 'tag-ok', accepted: 'tag-review', reserved: 'tag-held', issued: 'tag-plain', returned: 'tag-fault' };

export default function BinPartsList({ bin }: { bin: MapBin }) {
  const { data, error, loading, reload } = useBinParts(bin.id, 'page_size=200');
  return (
    <section className="card p-4" aria-label={`Parts in bin ${bin.code}`}>
      <h2 className="text-lg">Bin {bin.code}</h2>
      <p className="text-sm text-ink-soft">{bin.label}</p>
      <dl className="mt-2 grid grid-cols-4 gap-2 text-sm">
        <div><dt className="text-ink-faint text-xs">On hand</dt><dd className="num text-left font-semibold">{bin.on_hand}</dd></div>
        <div><dt className="text-ink-faint text-xs">Reserved</dt><dd className="num text-left">{bin.reserved}</dd></div>
        <div><dt className="text-ink-faint text-xs">Issued</dt><dd className="num text-left">{bin.issued}</dd></div>
        <div><dt className="text-ink-faint text-xs">Threshold</dt><dd className="num text-left">{bin.low_stock_threshold || '—'}</dd></div>
      </dl>
      <p className="text-sm mt-1">Home: {bin.location?.name ?? <span className="text-ink-faint">not set</span>}</p>
      <div className="mt-3 max-h-[28rem] overflow-y-auto">
        {loading && !data && <Loading what="parts" />}
        {error && <ErrorNotice error={error} retry={reload} />}
        {data && data.parts.length === 0 && <Empty>No parts in this bin.</Empty>}
        {data && data.parts.length > 0 && (
          <table className="table-plain">
            <thead>
              <tr><th>Serial</th><th>State</th><th className="text-right">IDSS</th><th className="text-right">VP</th><th>Where</th></tr>
            </thead>
            <tbody>
              {data.parts.map((p) => (
                <tr key={p.serial}>
                  <td><a href={`/parts/${encodeURIComponent(p.serial)}`}>{p.serial}</a></td>
                  <td><span className={TAG[p.status] ?? 'tag-plain'}>{p.status.replace('_', ' ')}</span></td>
                  <td className="num">{p.idss_a !== null ? formatQuantity(p.idss_a, 'A', 2) : '—'}</td>
                  <td className="num">{p.vp_v !== null ? formatQuantity(p.vp_v, 'V', 2) : '—'}</td>
                  <td className="text-ink-soft">{p.location ?? '—'}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        {data && data.total > data.parts.length && <p className="text-xs text-ink-faint mt-1">Showing {data.parts.length} of {data.total}.</p>}
      </div>
    </section>
  );
}

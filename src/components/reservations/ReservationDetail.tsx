import { useState } from 'react';
import type { ReservationCancelled, ReservationView } from '~/contracts/reservations';
import { idssInDatasheetSign } from '~/core/units/datasheet-sign';
import { columnFormat } from '~/core/units/format-quantity';
import { SHAPE_WORDS, STATUS_TAG, amps, dateTime, millivolts, percent, relativeTo, roleLabel, volts } from '../match/figures';
import { apiFetch } from '../ui/api-client';
import { useReservation } from '../api';
import { ErrorNotice, Loading } from '../ui/states';

type SetRow = { parts: { vgs_v: number; gm_s: number; idss_a: number }[] };
const channelOf = (r: { device_type: { channel: 'n' | 'p' } | null }): 'n' | 'p' => r.device_type?.channel ?? 'n';
/** One unit per column over a set's parts; IDSS in datasheet sign. */
function setColumns(s: SetRow, channel: 'n' | 'p') {
  return {
    vgs: columnFormat(s.parts.map((p) => p.vgs_v), 'V', 4, 1e-4),
    gm: columnFormat(s.parts.map((p) => p.gm_s), 'S', 3),
    idss: columnFormat(s.parts.map((p) => idssInDatasheetSign(p.idss_a, channel)), 'A', 3),
  };
}

function describeOp(r: ReservationView): string {
  const op = r.operating_point;
  if (!op) return '';
  if (op.kind === 'current') return `ID ${amps(op.id_a, 2)}, VDS ${volts(op.vds_v, 1)}`;
  if (op.kind === 'idss') return `VGS = 0 (IDSS), VDS ${volts(op.vds_v, 1)}`;
  return `self-bias RS ${op.rs_ohm} Ω, VDS ${volts(op.vds_v, 1)}`;
}

const PART_STATUS: Record<string, string> = { reserved: 'reserved', issued: 'issued', in_stock: 'back in stock', returned: 'returned' };

export default function ReservationDetail({ id, justMade }: { id: string; justMade: boolean }) {
  const { data: r, error, loading, reload } = useReservation(id);
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ kind: 'ok' | 'error'; text: string }>();

  async function cancel() {
    if (!window.confirm('Cancel this reservation? Its parts go back to stock for anyone to use.')) return;
    setBusy(true);
    try {
      const out = await apiFetch<ReservationCancelled>(`/api/reservations/${id}/cancel`, { method: 'POST', json: {} });
      setMessage({
        kind: 'ok',
        text: out.put_back.length
          ? `Cancelled. Stores had already picked ${out.put_back.join(', ')}; they will put them back.`
          : 'Cancelled. Every part is back in stock.',
      });
      reload();
    } catch (e) {
      setMessage({ kind: 'error', text: (e as Error).message });
    } finally {
      setBusy(false);
    }
  }

  if (loading && !r) return <Loading what="the reservation" />;
  if (error) return <ErrorNotice error={error} retry={reload} />;
  if (!r) return null;
  const words = r.shape ? SHAPE_WORDS[r.shape]! : { one: 'set', many: 'sets' };
  const matched = r.shape !== 'cascode_pair';
  const cascode = r.shape === 'cascode_pair' || r.shape === 'matched_cascode_pairs';
  return (
    <div className="space-y-5">
      <header className="flex flex-wrap items-baseline gap-3">
        <h1>
          Reservation <span className="font-mono">{r.code}</span>
        </h1>
        <span className={STATUS_TAG[r.status] ?? 'tag-plain'}>{r.status}</span>
      </header>
      {justMade && r.status === 'active' && (
        <p className="notice-info" role="status">
          Reserved. Stores have a pick list for these parts; you will get an e-mail when they are issued.
        </p>
      )}
      {message && <p className={message.kind === 'ok' ? 'notice-info' : 'notice-error'} role="status">{message.text}</p>}
      <div className="grid gap-4 md:grid-cols-3">
        <div className="card p-4">
          <h2 className="text-base mb-1">What</h2>
          <p className="text-sm">
            {r.sets.length} {r.sets.length === 1 ? words.one : words.many} of {r.device_type?.name ?? '—'}
          </p>
          <p className="text-sm text-ink-soft">matched at {describeOp(r)}</p>
          {r.tolerances && (
            <p className="text-sm text-ink-soft">
              tolerances: |ΔVGS| {r.tolerances.max_dvgs_v === null ? 'any' : millivolts(r.tolerances.max_dvgs_v, 1)}, gm mismatch{' '}
              {r.tolerances.max_gm_mismatch === null ? 'any' : percent(r.tolerances.max_gm_mismatch)}, IDSS mismatch{' '}
              {r.tolerances.max_idss_mismatch === null ? 'any' : percent(r.tolerances.max_idss_mismatch)}
              {r.tolerances.cascode_margin_v !== null && `, cascode margin ${volts(r.tolerances.cascode_margin_v, 2)}`}
            </p>
          )}
          {r.purpose && <p className="text-sm mt-1">For: {r.purpose}</p>}
          {(r.status === 'active' || r.status === 'issued') && (
            <p className="text-sm mt-2">
              <a href={`/estimates?set=${encodeURIComponent(r.id)}`}>Stage estimates for these parts</a>
            </p>
          )}
        </div>
        <div className="card p-4">
          <h2 className="text-base mb-1">Expiry</h2>
          {r.status === 'active' ? (
            <>
              <p className="text-sm" data-testid="expires-at">
                Held until <strong>{dateTime(r.expires_at)}</strong> ({relativeTo(r.expires_at)})
              </p>
              <p className="text-xs text-ink-faint mt-1">Unless stores have started picking it by then, its parts go back to stock.</p>
            </>
          ) : (
            <p className="text-sm">
              {r.status} {dateTime(r.closed_at)}
            </p>
          )}
        </div>
        <div className="card p-4">
          <h2 className="text-base mb-1">Pick list</h2>
          {r.pick_list ? (
            <>
              <p className="text-sm">
                <a href={`/pick-lists/${r.pick_list.id}`} className="font-mono">{r.pick_list.code}</a>{' '}
                <span className={STATUS_TAG[r.pick_list.status] ?? 'tag-plain'}>{r.pick_list.status}</span>
              </p>
              <p className="text-sm text-ink-soft">
                {r.pick_list.lines_picked} of {r.pick_list.lines_total} parts picked
                {r.pick_list.completed_at && `, issued ${dateTime(r.pick_list.completed_at)}`}
              </p>
            </>
          ) : (
            <p className="text-sm text-ink-faint">none</p>
          )}
          {r.status === 'active' && (
            <button type="button" className="btn-danger mt-3" disabled={busy} onClick={() => void cancel()}>
              Cancel reservation
            </button>
          )}
        </div>
      </div>
      {r.sets.map((s) => (
        <article key={s.index} className="card p-4" aria-label={`Set ${s.index + 1}`}>
          <header className="flex flex-wrap items-baseline gap-x-4 gap-y-1 mb-3">
            <h3 className="text-base">Set {s.index + 1}</h3>
            {matched && s.dvgs_v !== null && (
              <span className="text-sm text-ink-soft">
                |ΔVGS| {millivolts(s.dvgs_v)} · gm mismatch {percent(s.gm_mismatch, 2)} · IDSS mismatch {percent(s.idss_mismatch, 2)}
              </span>
            )}
            {s.cascode_headroom_v !== undefined && <span className="text-sm text-ink-soft">saturation headroom {volts(s.cascode_headroom_v, 2)}</span>}
            <span className="ml-auto text-sm">
              <a href={`/api/reservations/${r.id}/sets/${s.index + 1}/model-cards`}>SPICE .model cards</a> ·{' '}
              <a href={`/api/reservations/${r.id}/sets/${s.index + 1}/figures.csv`}>figures CSV</a>
            </span>
          </header>
          <div className="overflow-x-auto">
            <table className="table-plain">
              <thead>
                <tr>
                  <th>Serial</th>
                  <th>Role</th>
                  <th>Bin</th>
                  <th>Location</th>
                  <th className="num !text-right">VGS ({setColumns(s, channelOf(r)).vgs.unit})</th>
                  <th className="num !text-right">gm ({setColumns(s, channelOf(r)).gm.unit})</th>
                  <th className="num !text-right">IDSS ({setColumns(s, channelOf(r)).idss.unit})</th>
                  <th>Now</th>
                </tr>
              </thead>
              <tbody>
                {s.parts.map((p) => (
                  <tr key={p.serial}>
                    <td className="font-mono whitespace-nowrap">{p.serial}</td>
                    <td>{roleLabel(p.role, p.cascode_index)}</td>
                    <td>{p.bin_code ?? '—'}</td>
                    <td>{p.location ?? '—'}</td>
                    <td className="num">{setColumns(s, channelOf(r)).vgs.number(p.vgs_v)}</td>
                    <td className="num">{setColumns(s, channelOf(r)).gm.number(p.gm_s)}</td>
                    <td className="num">{setColumns(s, channelOf(r)).idss.number(idssInDatasheetSign(p.idss_a, channelOf(r)))}</td>
                    <td>
                      <span className={STATUS_TAG[p.status] ?? 'tag-plain'}>{PART_STATUS[p.status] ?? p.status.replace('_', ' ')}</span>
                      {p.picked && p.status === 'reserved' && <span className="ml-1 text-xs text-ink-faint">picked</span>}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {cascode && <p className="text-xs text-ink-faint mt-2">VGS, gm and IDSS as matched: each part at its own VDS in the cascode.</p>}
        </article>
      ))}
    </div>
  );
}

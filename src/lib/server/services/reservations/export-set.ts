import { eq, inArray } from 'drizzle-orm';
import { writeCsv } from '~/core/csv/write-csv';
import { formatModelCard } from '~/core/fit/model-card';
import { formatPercent, formatSignificant, type QuantityUnit } from '~/core/units/format-quantity';
import { getDb, schema } from '~/db/client';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import type { StoredProposalResult } from '../match/create-proposal';
import { loadOwnProposal } from '../match/get-proposal';
import { loadOwnReservation } from './get';
import { reservationCode } from './reservation-view';

export type SetExportFormat = 'spice' | 'csv';

export interface ExportFile {
  filename: string;
  contentType: string;
  body: string;
}

const CSV_COLUMNS = [
  'set', 'role', 'cascode', 'serial', 'lot', 'bin', 'location', 'id_a', 'vds_v', 'vgs_v', 'vgs_sigma_v', 'gm_s', 'idss_a', 'vds_sat_v',
  'figures_from', 'compared_at_c', 'temperature_shift_v',
  'vto_v', 'beta_a_per_v2', 'lambda_per_v', 'rs_ohm', 'rd_ohm', 'temperature_c',
  'set_dvgs_v', 'set_dvgs_sigma_v', 'set_gm_mismatch', 'set_idss_mismatch', 'set_cascode_headroom_v',
] as const;


// SPICE decks are read by tools that expect ASCII: plain minus, "u" for micro, "ohm".
const ascii = (text: string) => text.replace(/\u2212/g, '-').replace(/µ/g, 'u').replace(/Ω/g, 'ohm');
const fig = (value: number, unit: QuantityUnit, sig = 4) => ascii(formatSignificant(value, unit, sig));

function describeOperatingPoint(op: StoredProposalResult['operating_point']): string {
  if (op.kind === 'current') return `ID = ${fig(op.id_a ?? Number.NaN, 'A')}, |VDS| = ${fig(op.vds_v, 'V', 3)}`;
  if (op.kind === 'idss') return `VGS = 0 (IDSS), |VDS| = ${fig(op.vds_v, 'V', 3)}`;
  return `self-bias RS = ${fig(op.rs_ohm ?? Number.NaN, 'Ω')}, |VDS| = ${fig(op.vds_v, 'V', 3)}`;
}

/** The model cards (NJF/PJF, one per part, named by serial) or the CSV of one set's figures. */
async function exportSet(result: StoredProposalResult, setNo: number, label: string, format: SetExportFormat): Promise<ExportFile> {
  const set = result.sets[setNo - 1];
  if (!set) throw new AppError('set_not_found', { setNo, label, sets: result.sets.length });
  const ids = set.parts.map((p) => p.part_id);
  const rows = await getDb()
    .select({ partId: schema.part.id, fit: schema.fit, temperatureC: schema.sweep.temperatureC })
    .from(schema.part)
    .innerJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
    .innerJoin(schema.sweep, eq(schema.sweep.id, schema.fit.sweepId))
    .where(inArray(schema.part.id, ids));
  const fitOf = new Map(rows.map((r) => [r.partId, r]));
  const base = `${label}-set${setNo}`.replace(/[^A-Za-z0-9_-]/g, '_');
  const channel = result.device_type.channel;
  if (format === 'spice') {
    const lines = [
      `* Sluice matched set ${setNo} of ${label}: ${result.device_type.name}, ${result.shape.replace(/_/g, ' ')}`,
      `* matched at ${describeOperatingPoint(result.operating_point)}; |dVGS| = ${fig(set.dvgs_v, 'V', 3)}${set.dvgs_sigma_v ? ` +- ${fig(set.dvgs_sigma_v, 'V', 2)} (1 sigma)` : ''} at ${result.temperature_c ?? 25} C, gm mismatch = ${ascii(formatPercent(set.gm_mismatch, 2))}, IDSS mismatch = ${ascii(formatPercent(set.idss_mismatch, 2))}`,
    ];
    for (const p of set.parts) {
      const f = fitOf.get(p.part_id);
      if (!f) {
        lines.push(`* ${p.serial}: no current fit on record`);
        continue;
      }
      lines.push(`* ${p.serial}, role ${p.role}${p.cascode_index !== undefined ? ` of cascode ${p.cascode_index + 1}` : ''}, fit ${f.fit.id} (${f.fit.engineVersion})`);
      lines.push(
        formatModelCard({
          serial: p.serial,
          channel,
          params: { vtoV: f.fit.vtoV, betaAPerV2: f.fit.betaAPerV2, lambdaPerV: f.fit.lambdaPerV, rsOhm: f.fit.rsOhm, rdOhm: f.fit.rdOhm },
          temperatureC: f.temperatureC,
        }),
      );
    }
    return { filename: `${base}.lib`, contentType: 'text/plain; charset=utf-8', body: lines.join('\n') + '\n' };
  }
  const csvRows = set.parts.map((p) => {
    const f = fitOf.get(p.part_id);
    return [
      setNo, p.role, p.cascode_index !== undefined ? p.cascode_index + 1 : '', p.serial, p.lot, p.bin_code, p.location,
      channel === 'n' ? p.id_a : -p.id_a, channel === 'n' ? p.vds_v : -p.vds_v, p.vgs_v, p.vgs_sigma_v ?? '', p.gm_s, p.idss_a, p.vds_sat_v,
      p.source ?? 'model', result.temperature_c ?? 25, p.temperature_shift_v ?? 0,
      f?.fit.vtoV, f?.fit.betaAPerV2, f?.fit.lambdaPerV, f?.fit.rsOhm, f?.fit.rdOhm, f?.temperatureC,
      set.dvgs_v, set.dvgs_sigma_v ?? '', set.gm_mismatch, set.idss_mismatch, set.cascode_headroom_v,
    ];
  });
  return { filename: `${base}.csv`, contentType: 'text/csv; charset=utf-8', body: writeCsv(CSV_COLUMNS, csvRows) };
}

export async function exportReservationSet({
  actor,
  id,
  setNo,
  format,
}: {
  actor: Actor | null;
  id: string;
  setNo: number;
  format: SetExportFormat;
}): Promise<ExportFile> {
  requirePermission(actor, 'match:request');
  const view = await loadOwnReservation(getDb(), actor, id);
  if (!view.proposal_id) throw new AppError('reservation_has_no_figures', { code: view.code });
  const proposal = await loadOwnProposal(getDb(), actor, view.proposal_id);
  return exportSet(proposal.result as StoredProposalResult, setNo, reservationCode(view.id), format);
}

export async function exportProposalSet({
  actor,
  id,
  setNo,
  format,
}: {
  actor: Actor | null;
  id: string;
  setNo: number;
  format: SetExportFormat;
}): Promise<ExportFile> {
  requirePermission(actor, 'match:request');
  const proposal = await loadOwnProposal(getDb(), actor, id);
  return exportSet(proposal.result as StoredProposalResult, setNo, `proposal-${proposal.id.slice(0, 8)}`, format);
}

import { and, asc, eq, inArray } from 'drizzle-orm';
import { measureSetMismatch } from '~/core/match/set-mismatch';
import { reservedSetFigures, type ReservedOperatingPoint } from '~/core/reservations/reserved-set-figures';
import { describePartStatus, PART_STATUSES, type PartStatus } from '~/core/stock/part-transitions';
import { formatPercent, formatSignificant } from '~/core/units/format-quantity';
import { schema, type DbOrTx } from '~/db/client';
import { serverEnv } from '~/lib/server/env';
import { sendMail, type OutgoingMail } from '~/lib/server/mail';
import type { StoredProposalResult } from '../match/create-proposal';
import { loadPartBases } from '../parts/part-basis';
import { reservationCode } from './reservation-view';

export type PartChange = 'refitted' | 'marked for retest' | 'scrapped';

const v = (x: number) => formatSignificant(x, 'V', 4);
const s = (x: number) => formatSignificant(x, 'S', 3);
const a = (x: number) => formatSignificant(x, 'A', 3);
const words = (status: string) => ((PART_STATUSES as readonly string[]).includes(status) ? describePartStatus(status as PartStatus) : status);

function describeOp(op: ReservedOperatingPoint): string {
  if (op.kind === 'current') return `ID = ${a(op.idA)}, |VDS| = ${formatSignificant(op.vdsV, 'V', 3)}`;
  if (op.kind === 'idss') return `VGS = 0 (IDSS), |VDS| = ${formatSignificant(op.vdsV, 'V', 3)}`;
  return `self-bias RS = ${formatSignificant(op.rsOhm, 'Ω', 3)}, |VDS| = ${formatSignificant(op.vdsV, 'V', 3)}`;
}

function operatingPointOf(result: StoredProposalResult): ReservedOperatingPoint | null {
  const op = result.operating_point;
  const vdsV = Math.abs(op.vds_v);
  if (op.kind === 'current' && op.id_a !== null) return { kind: 'current', idA: Math.abs(op.id_a), vdsV };
  if (op.kind === 'idss') return { kind: 'idss', vdsV };
  if (op.kind === 'self_bias' && op.rs_ohm !== null) return { kind: 'self_bias', rsOhm: op.rs_ohm, vdsV };
  return null;
}

/**
 * The mails that tell each designer with an active reservation holding one of `partIds` what
 * happened to the part and what its set's figures are now (from the current fits, at the
 * reservation's operating point). Reads inside the caller's transaction, after the change;
 * send them with `sendPartChangeMails` once it commits.
 */
export async function partChangeMails(
  tx: DbOrTx,
  partIds: readonly number[],
  change: { what: PartChange; by: string | null; reason: string | null },
): Promise<OutgoingMail[]> {
  if (partIds.length === 0) return [];
  const hits = await tx
    .select({ reservationId: schema.reservationPart.reservationId, setIndex: schema.reservationPart.setIndex, partId: schema.reservationPart.partId })
    .from(schema.reservationPart)
    .innerJoin(schema.reservation, eq(schema.reservation.id, schema.reservationPart.reservationId))
    .where(and(inArray(schema.reservationPart.partId, [...partIds]), eq(schema.reservation.status, 'active')));
  const mails: OutgoingMail[] = [];
  for (const reservationId of [...new Set(hits.map((h) => h.reservationId))]) {
    const [row] = await tx
      .select({ r: schema.reservation, name: schema.user.name, email: schema.user.email, result: schema.matchProposal.result })
      .from(schema.reservation)
      .innerJoin(schema.user, eq(schema.user.id, schema.reservation.designerUserId))
      .leftJoin(schema.matchProposal, eq(schema.matchProposal.id, schema.reservation.proposalId))
      .where(eq(schema.reservation.id, reservationId));
    const result = row.result as StoredProposalResult | null;
    const op = result ? operatingPointOf(result) : null;
    const channel = result?.device_type.channel ?? 'n';
    const code = reservationCode(reservationId);
    const changedHere = hits.filter((h) => h.reservationId === reservationId);
    const lines: string[] = [`Hello ${row.name},`, ''];
    for (const setIndex of [...new Set(changedHere.map((h) => h.setIndex))].sort((x, y) => x - y)) {
      const members = await tx
        .select({ rp: schema.reservationPart, serial: schema.part.serial, status: schema.part.status, fit: schema.fit })
        .from(schema.reservationPart)
        .innerJoin(schema.part, eq(schema.part.id, schema.reservationPart.partId))
        .leftJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
        .where(and(eq(schema.reservationPart.reservationId, reservationId), eq(schema.reservationPart.setIndex, setIndex)))
        .orderBy(asc(schema.reservationPart.id));
      const changedSerials = members.filter((m) => changedHere.some((h) => h.partId === m.rp.partId && h.setIndex === setIndex)).map((m) => m.serial);
      lines.push(
        `Part${changedSerials.length > 1 ? 's' : ''} ${changedSerials.join(', ')} of set ${setIndex + 1} of your reservation ${code}${row.r.purpose ? ` (${row.r.purpose})` : ''} ${changedSerials.length > 1 ? 'were' : 'was'} ${change.what}${change.by ? ` by ${change.by}` : ''}${change.reason ? `: ${change.reason}` : ''}.`,
      );
      if (!op) {
        lines.push('The set was reserved without an operating point on record, so its figures cannot be compared.', '');
        continue;
      }
      // A cascode set is matched on its lower parts only.
      const matchedRoles = members.some((m) => m.rp.role === 'lower') ? members.filter((m) => m.rp.role === 'lower') : members;
      const bases = await loadPartBases(tx, members.map((m) => m.rp.partId));
      const figures = reservedSetFigures(
        members.map((m) => ({
          serial: m.serial,
          role: m.rp.role,
          status: m.status,
          matched: { vgsV: m.rp.vgsV, gmS: m.rp.gmS, idssA: m.rp.idssA },
          basis: bases.get(m.rp.partId)?.basis ?? null,
        })),
        op,
        channel,
        result?.temperature_c,
      );
      const matched = figures.parts.filter((p) => matchedRoles.some((m) => m.serial === p.serial));
      const was = measureSetMismatch(matched.map((p) => p.was));
      const now = matched.every((p) => p.now !== null) ? measureSetMismatch(matched.map((p) => p.now!)) : null;
      lines.push(`The set's figures at ${describeOp(op)}, when reserved → now (from each part's current fit):`, '');
      for (const p of figures.parts) {
        const pn = p.now;
        lines.push(
          `  ${p.serial} (${p.role}, ${words(p.status)}): VGS ${v(p.was.vgsV)} → ${pn ? v(pn.vgsV) : '—'}, gm ${s(p.was.gmS)} → ${pn ? s(pn.gmS) : '—'}, IDSS ${a(p.was.idssA)} → ${pn ? a(pn.idssA) : '—'}`,
        );
      }
      lines.push(
        '',
        `  Set: |ΔVGS| ${v(was.dvgsV)} → ${now ? v(now.dvgsV) : '—'}, gm mismatch ${formatPercent(was.gmMismatch, 2)} → ${now ? formatPercent(now.gmMismatch, 2) : '—'}, IDSS mismatch ${formatPercent(was.idssMismatch, 2)} → ${now ? formatPercent(now.idssMismatch, 2) : '—'}`,
        '',
      );
    }
    lines.push(
      'A part that is no longer reserved will not be picked: keep the set, cancel the reservation, or ask for a new one.',
      `Reservation: ${serverEnv().publicUrl}/reservations/${reservationId}`,
      '',
    );
    mails.push({ to: row.email, subject: `A part of your reservation ${code} was ${change.what}`, text: lines.join('\n') });
  }
  return mails;
}

/** Sends the mails after the change has committed; a failure is logged and the change stands. */
export async function sendPartChangeMails(mails: readonly OutgoingMail[]): Promise<void> {
  for (const m of mails) {
    try {
      await sendMail(m);
    } catch (err) {
      console.error('[reservations] part-change mail failed', err);
    }
  }
}

import { asc, eq, inArray } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { serverEnv } from '~/lib/server/env';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { checkLowStock, mailLowStockAlerts } from '../alerts/low-stock';
import { changePartStatuses } from '../parts/change-status';
import type { ReservationConfirmed } from '~/contracts/pick-lists';
import { loadPickListView } from '../pick-lists/pick-list-view';
import { loadReservationView, reservationCode } from '../reservations/reservation-view';
import type { StoredProposalResult } from './create-proposal';
import { loadOwnProposal } from './get-proposal';
import { ConfirmRequest } from '~/contracts/match';

export interface TakenPart {
  serial: string;
  status: string;
  reason: string;
}

const WHY: Record<string, string> = {
  reserved: 'reserved by another request',
  issued: 'issued to another request',
  scrapped: 'scrapped',
  quarantined: 'quarantined',
};

/**
 * Reserves every part of every set of a proposal, or none. One transaction: the proposal row
 * is locked (a proposal is confirmed once), then its parts `FOR UPDATE` in id order — two
 * confirmations that share parts queue on the first shared row, and the later one re-reads
 * it as reserved and is refused, naming each part it can no longer have. Then the parts move
 * in_stock → reserved (`changePartStatuses`), the reservation with its expiry, its parts with
 * the figures they were matched on, and a pick list whose lines run in location order.
 */
export async function confirmMatchProposal({
  actor,
  proposalId,
  input,
}: {
  actor: Actor | null;
  proposalId: string;
  input?: unknown;
}): Promise<ReservationConfirmed> {
  requirePermission(actor, 'match:reserve');
  const { purpose } = ConfirmRequest.parse(input ?? {});
  const db = getDb();
  const { reservationId, pickListId, alerts } = await db.transaction(async (tx) => {
    const proposal = await loadOwnProposal(tx, actor, proposalId, true);
    if (proposal.confirmedReservationId) {
      throw new AppError('proposal_already_confirmed', { reservation: reservationCode(proposal.confirmedReservationId) }, {
        reservation_id: proposal.confirmedReservationId,
      });
    }
    const result = proposal.result as StoredProposalResult;
    const wanted = result.sets.flatMap((s) => s.parts.map((p) => ({ ...p, setIndex: s.index })));
    if (wanted.length === 0) {
      throw new AppError('proposal_has_no_sets');
    }
    const ids = wanted.map((w) => w.part_id).sort((a, b) => a - b);
    const locked = await tx
      .select({ id: schema.part.id, serial: schema.part.serial, status: schema.part.status, locationId: schema.part.locationId })
      .from(schema.part)
      .where(inArray(schema.part.id, ids))
      .orderBy(asc(schema.part.id))
      .for('update');
    const byId = new Map(locked.map((r) => [r.id, r]));
    const taken: TakenPart[] = wanted
      .filter((w) => byId.get(w.part_id)?.status !== 'in_stock')
      .map((w) => {
        const status = byId.get(w.part_id)?.status ?? 'missing';
        return { serial: w.serial, status, reason: WHY[status] ?? `no longer in stock (${status.replace('_', ' ')})` };
      });
    if (taken.length) {
      const names = taken.map((t) => `${t.serial} (${t.reason})`).join(', ');
      throw new AppError(
        'parts_taken',
        { serials: taken.map((t) => t.serial) },
        { taken },
      );
    }

    const expiresAt = new Date(Date.now() + serverEnv().reservationDays * 86_400_000);
    const [reservation] = await tx
      .insert(schema.reservation)
      .values({ proposalId: proposal.id, designerUserId: actor.userId!, purpose: purpose ?? '', status: 'active', expiresAt })
      .returning({ id: schema.reservation.id });
    const code = reservationCode(reservation!.id);
    const changed = await changePartStatuses(
      tx,
      actor,
      ids.map((partId) => ({ partId, to: 'reserved', set: { reservationId: reservation!.id } })),
      { action: 'part.reserve', reason: `reservation ${code}` },
    );
    // Reserved parts are no longer on hand: a bin may have dropped below its threshold.
    const alerts = await checkLowStock(tx, changed.map((c) => c.binId));
    await tx.insert(schema.reservationPart).values(
      wanted.map((w) => ({
        reservationId: reservation!.id,
        partId: w.part_id,
        setIndex: w.setIndex,
        role: w.role,
        vgsV: w.vgs_v,
        gmS: w.gm_s,
        idssA: w.idss_a,
      })),
    );

    const locationIds = [...new Set(locked.map((r) => r.locationId).filter((x): x is number => x !== null))];
    const locations = locationIds.length
      ? await tx.select({ id: schema.location.id, name: schema.location.name }).from(schema.location).where(inArray(schema.location.id, locationIds))
      : [];
    const locationName = new Map(locations.map((l) => [l.id, l.name]));
    const byName = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });
    // Picking order: by location name (numbers in names compared as numbers), parts without a
    // recorded location last, then by set and role so a set's parts in one place come together.
    const ordered = wanted
      .map((w) => ({ ...w, locationId: byId.get(w.part_id)!.locationId }))
      .sort((a, b) => {
        const la = a.locationId === null ? null : locationName.get(a.locationId) ?? null;
        const lb = b.locationId === null ? null : locationName.get(b.locationId) ?? null;
        if (la !== lb) return la === null ? 1 : lb === null ? -1 : byName.compare(la, lb);
        return a.setIndex - b.setIndex || byName.compare(a.role, b.role) || byName.compare(a.serial, b.serial);
      });
    const [list] = await tx.insert(schema.pickList).values({ reservationId: reservation!.id, status: 'open' }).returning({ id: schema.pickList.id });
    await tx.insert(schema.pickLine).values(
      ordered.map((w, i) => ({
        pickListId: list!.id,
        lineNo: i + 1,
        partId: w.part_id,
        locationId: w.locationId,
        setIndex: w.setIndex,
        role: w.role,
      })),
    );
    await tx.update(schema.matchProposal).set({ confirmedReservationId: reservation!.id }).where(eq(schema.matchProposal.id, proposal.id));
    await writeAudit(tx, actor, {
      action: 'reservation.create',
      subjectType: 'reservation',
      subjectId: reservation!.id,
      after: { code, proposal_id: proposal.id, parts: wanted.map((w) => w.serial), sets: result.sets.length, expires_at: expiresAt.toISOString(), pick_list_id: list!.id },
    });
    return { reservationId: reservation!.id, pickListId: list!.id, alerts };
  });
  await mailLowStockAlerts(alerts);
  const reservation = (await loadReservationView(db, reservationId))!;
  const pickList = (await loadPickListView(db, pickListId))!;
  return { reservation, pick_list: pickList, expires_at: reservation.expires_at };
}

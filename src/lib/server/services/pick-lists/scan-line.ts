import { normalizeSerial } from '~/core/serial/normalize-serial';
import { and, eq, sql } from 'drizzle-orm';
import { describePartStatus, type PartStatus } from '~/core/stock/part-transitions';
import { getDb, schema } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { AppError, type AppErrorArgs, type ErrorParams } from '~/core/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { PickScanRequest, type PickScanResult } from '~/contracts/pick-lists';
import { changePartStatuses } from '../parts/change-status';
import { expireDueReservations } from '../reservations/expire';
import { pickListCode, reservationCode } from '../reservations/reservation-view';
import { parsePickListId } from './get';
import { mailIssuedReservation } from './mail-issued';
import { loadPickListView } from './pick-list-view';

export type ScanRefusal = 'not_on_list' | 'already_picked' | 'list_closed';

/** The scan's refusal: the catalogue's error, with `refusal` (what the scanner screen switches on). */
function refusal<C extends 'pick_list_closed' | 'pick_list_reservation_closed' | 'not_on_pick_list' | 'already_picked'>(
  refusal: ScanRefusal,
  code: C,
  params: ErrorParams<C>,
  extra: Record<string, unknown> = {},
): AppError<C> {
  return new AppError<C>(code, ...([params, { refusal, ...extra }] as AppErrorArgs<C>));
}

/**
 * Stores confirm a line by scanning its part's serial, in whatever order they reach the parts:
 * the serial picks the line it belongs to. A serial is refused, saying why, when it is not on
 * this list or was already picked. The scan that picks the last line issues every part (reserved → issued), closes
 * the reservation and the list in the same transaction, then mails the designer.
 * Locks the reservation, then the list (the order cancel and expiry use too).
 */
export async function scanPickLine({ actor, id, input }: { actor: Actor | null; id: string; input: unknown }): Promise<PickScanResult> {
  requirePermission(actor, 'pickLists:fulfil');
  const listId = parsePickListId(id);
  const { serial } = PickScanRequest.parse(input);
  await expireDueReservations();
  const db = getDb();
  const out = await db.transaction(async (tx) => {
    const [head] = await tx.select({ reservationId: schema.pickList.reservationId }).from(schema.pickList).where(eq(schema.pickList.id, listId));
    if (!head) throw new AppError('pick_list_not_found', { id: pickListCode(listId) });
    const [reservation] = await tx.select().from(schema.reservation).where(eq(schema.reservation.id, head.reservationId)).for('update');
    const [list] = await tx.select().from(schema.pickList).where(eq(schema.pickList.id, listId)).for('update');
    const code = pickListCode(listId);
    if (list!.status !== 'open') {
      throw refusal('list_closed', 'pick_list_closed', { code, status: list!.status });
    }
    if (reservation!.status !== 'active') {
      throw refusal('list_closed', 'pick_list_reservation_closed', { reservation: reservationCode(reservation!.id), status: reservation!.status });
    }
    const lines = await tx
      .select({ line: schema.pickLine, serial: schema.part.serial, location: schema.location.name, pickerName: schema.user.name })
      .from(schema.pickLine)
      .innerJoin(schema.part, eq(schema.part.id, schema.pickLine.partId))
      .leftJoin(schema.location, eq(schema.location.id, schema.pickLine.locationId))
      .leftJoin(schema.user, eq(schema.user.id, schema.pickLine.pickedBy))
      .where(eq(schema.pickLine.pickListId, listId))
      .orderBy(schema.pickLine.lineNo);
    const hit =
      lines.find((l) => normalizeSerial(l.serial) === serial);
    if (!hit) {
      const [other] = await tx
        .select({ status: schema.part.status, location: schema.location.name })
        .from(schema.part)
        .leftJoin(schema.location, eq(schema.location.id, schema.part.locationId))
        .where(sql`upper(${schema.part.serial}) = ${serial}`);
      const part = other ? { status: describePartStatus(other.status as PartStatus), location: other.location } : null;
      throw refusal('not_on_list', 'not_on_pick_list', { serial, code, part });
    }
    if (hit.line.pickedAt) {
      const at = hit.line.pickedAt.toISOString().slice(11, 16);
      throw refusal('already_picked', 'already_picked', { serial: hit.serial, line: hit.line.lineNo, at, picker: hit.pickerName }, {
        line_no: hit.line.lineNo,
      });
    }
    const now = new Date();
    await tx.update(schema.pickLine).set({ pickedAt: now, pickedBy: actor.userId }).where(eq(schema.pickLine.id, hit.line.id));
    await writeAudit(tx, actor, {
      action: 'pick_line.pick',
      subjectType: 'part',
      subjectId: hit.serial,
      after: { pick_list: code, line_no: hit.line.lineNo },
    });
    const remaining = lines.filter((l) => !l.line.pickedAt && l.line.id !== hit.line.id).length;
    let issued: string[] = [];
    if (remaining === 0) {
      const changed = await changePartStatuses(
        tx,
        actor,
        lines.map((l) => ({ partId: l.line.partId, to: 'issued' })),
        { action: 'part.issue', reason: `pick list ${code} for reservation ${reservationCode(reservation!.id)}` },
      );
      issued = changed.map((c) => c.serial);
      await tx.update(schema.pickList).set({ status: 'complete', completedAt: now, completedBy: actor.userId }).where(and(eq(schema.pickList.id, listId)));
      await tx.update(schema.reservation).set({ status: 'issued', closedAt: now }).where(eq(schema.reservation.id, reservation!.id));
      await writeAudit(tx, actor, {
        action: 'reservation.issue',
        subjectType: 'reservation',
        subjectId: reservation!.id,
        before: { status: 'active' },
        after: { status: 'issued', pick_list: code, parts: issued },
      });
    }
    return { lineNo: hit.line.lineNo, serial: hit.serial, issued, reservationId: reservation!.id };
  });
  const mailedTo = out.issued.length ? await mailIssuedReservation(out.reservationId) : null;
  return {
    line_no: out.lineNo,
    serial: out.serial,
    complete: out.issued.length > 0,
    issued: out.issued,
    mailed_to: mailedTo,
    pick_list: (await loadPickListView(db, listId))!,
  };
}

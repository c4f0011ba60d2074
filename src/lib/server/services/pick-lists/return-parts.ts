import { and, eq, inArray } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { PickReturnRequest, type PickReturnResult } from '~/contracts/pick-lists';
import { checkLowStock } from '../alerts/low-stock';
import { changePartStatuses } from '../parts/change-status';
import { pickListCode } from '../reservations/reservation-view';
import { parsePickListId } from './get';
import { loadPickListView } from './pick-list-view';

/**
 * Stores take back parts issued through a pick list: issued → returned, and unless `restock`
 * is false, returned → in stock at the location the line was picked from, free of the
 * reservation. All or nothing: a serial not issued on this list refuses the whole return.
 */
export async function returnPickedParts({ actor, id, input }: { actor: Actor | null; id: string; input: unknown }): Promise<PickReturnResult> {
  requirePermission(actor, 'pickLists:fulfil');
  const listId = parsePickListId(id);
  const req = PickReturnRequest.parse(input);
  const db = getDb();
  const code = pickListCode(listId);
  const returned = await db.transaction(async (tx) => {
    const lines = await tx
      .select({ partId: schema.pickLine.partId, locationId: schema.pickLine.locationId, serial: schema.part.serial, status: schema.part.status })
      .from(schema.pickLine)
      .innerJoin(schema.part, eq(schema.part.id, schema.pickLine.partId))
      .where(and(eq(schema.pickLine.pickListId, listId), inArray(schema.part.serial, req.serials)));
    const bySerial = new Map(lines.map((l) => [l.serial, l]));
    const problems = req.serials.flatMap((s) => {
      const l = bySerial.get(s);
      if (!l) return [`${s} is not on pick list ${code}`];
      if (l.status !== 'issued') return [`${s} is ${l.status.replace('_', ' ')}, not issued`];
      return [];
    });
    if (problems.length) throw new AppError('return_refused', { problems }, { problems });
    const reason = req.reason ? `return from ${code}: ${req.reason}` : `return from ${code}`;
    await changePartStatuses(
      tx,
      actor,
      lines.map((l) => ({ partId: l.partId, to: 'returned', set: { reservationId: null } })),
      { action: 'part.return', reason },
    );
    if (req.restock) {
      const changed = await changePartStatuses(
        tx,
        actor,
        lines.map((l) => ({ partId: l.partId, to: 'in_stock', set: { locationId: l.locationId } })),
        { action: 'part.restock', reason },
      );
      await checkLowStock(tx, changed.map((c) => c.binId), { mayDrop: false });
    }
    return lines.map((l) => l.serial);
  });
  return { returned, restocked: req.restock, pick_list: (await loadPickListView(db, listId))! };
}

import { eq } from 'drizzle-orm';
import { z } from 'zod';
import { getDb, schema, type DbOrTx } from '~/db/client';
import { AppError } from '~/lib/server/errors';
import { maySeeOwnedRecord, requirePermission, type Actor } from '~/lib/server/identity';
import type { StoredProposalResult } from './create-proposal';
import type { ProposalView } from '~/contracts/match';

export const ProposalId = z.uuid('a proposal id is a UUID');

/** A stored proposal row of the actor's own, or not_found (another designer's looks absent). */
export async function loadOwnProposal(db: DbOrTx, actor: Actor, id: string, lock = false) {
  const parsed = ProposalId.safeParse(id);
  if (!parsed.success) throw new AppError('proposal_not_found', { id });
  const q = db.select().from(schema.matchProposal).where(eq(schema.matchProposal.id, parsed.data));
  const [row] = lock ? await q.for('update') : await q;
  if (!row || !maySeeOwnedRecord('matchProposal', actor, row.designerUserId)) {
    throw new AppError('proposal_not_found', { id });
  }
  return row;
}

export async function getMatchProposal({ actor, id }: { actor: Actor | null; id: string }): Promise<ProposalView> {
  requirePermission(actor, 'match:request');
  const row = await loadOwnProposal(getDb(), actor, id);
  return {
    id: row.id,
    created_at: row.createdAt.toISOString(),
    reservation_id: row.confirmedReservationId,
    ...(row.result as StoredProposalResult),
  };
}

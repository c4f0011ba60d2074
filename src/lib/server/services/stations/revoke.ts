import { eq } from 'drizzle-orm';
import { z } from 'zod';
import type { StationRevoked } from '~/contracts/stations';
import { getDb, schema } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';

export const RevokeStationInput = z.object({ id: z.string().min(1) });

/** Revokes a token at once: the middleware refuses it from the next request on. */
export async function revokeStationToken({ actor, input }: { actor: Actor | null; input: unknown }): Promise<StationRevoked> {
  requirePermission(actor, 'stations:manage');
  const { id } = RevokeStationInput.parse(input);
  return getDb().transaction(async (tx) => {
    const [row] = await tx.select().from(schema.stationToken).where(eq(schema.stationToken.id, id)).for('update');
    if (!row) throw new AppError('station_token_not_found');
    if (row.revokedAt) return { id, revoked_at: row.revokedAt.toISOString() };
    const revokedAt = new Date();
    await tx.update(schema.stationToken).set({ revokedAt }).where(eq(schema.stationToken.id, id));
    await writeAudit(tx, actor, { action: 'station.revoke', subjectType: 'station', subjectId: id, before: { revoked: false }, after: { revoked: true } });
    return { id, revoked_at: revokedAt.toISOString() };
  });
}

import { desc } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import type { StationJson } from '~/contracts/stations';

export async function listStations({ actor }: { actor: Actor | null }): Promise<StationJson[]> {
  requirePermission(actor, 'stations:manage');
  const rows = await getDb().select().from(schema.stationToken).orderBy(desc(schema.stationToken.createdAt));
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    token_prefix: r.tokenPrefix,
    created_at: r.createdAt.toISOString(),
    last_used_at: r.lastUsedAt?.toISOString() ?? null,
    revoked_at: r.revokedAt?.toISOString() ?? null,
  }));
}

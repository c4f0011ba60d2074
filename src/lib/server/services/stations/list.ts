import { desc } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';

export interface StationRow {
  id: string;
  name: string;
  token_prefix: string;
  created_at: string;
  last_used_at: string | null;
  revoked_at: string | null;
}

export async function listStations({ actor }: { actor: Actor | null }): Promise<StationRow[]> {
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

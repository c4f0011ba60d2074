import { randomBytes, randomUUID } from 'node:crypto';
import { CreateStationInput, type StationCreated } from '~/contracts/stations';
import { getDb, schema } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { hashStationToken, requirePermission, type Actor } from '~/lib/server/identity';

/**
 * Makes a test-station token. The token itself is returned once, here, and never stored:
 * the database keeps its SHA-256 and a short prefix to recognise it by.
 */
export async function createStationToken({ actor, input }: { actor: Actor | null; input: unknown }): Promise<StationCreated> {
  requirePermission(actor, 'stations:manage');
  const data = CreateStationInput.parse(input);
  const token = `sls_${randomBytes(24).toString('base64url')}`;
  const id = randomUUID();
  const tokenPrefix = token.slice(0, 10);
  const row = await getDb().transaction(async (tx) => {
    const [created] = await tx
      .insert(schema.stationToken)
      .values({ id, name: data.name, tokenSha256: hashStationToken(token), tokenPrefix, createdBy: actor.userId })
      .returning();
    await writeAudit(tx, actor, { action: 'station.create', subjectType: 'station', subjectId: id, after: { name: data.name, token_prefix: tokenPrefix } });
    return created;
  });
  return { id: row.id, name: row.name, token, token_prefix: tokenPrefix, created_at: row.createdAt.toISOString() };
}

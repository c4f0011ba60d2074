import { asc } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';

/** Device types for the stock pages' pickers. */
export async function listStockDeviceTypes({ actor }: { actor: Actor | null }) {
  requirePermission(actor, 'stock:read');
  return getDb()
    .select({ id: schema.deviceType.id, name: schema.deviceType.name, channel: schema.deviceType.channel })
    .from(schema.deviceType)
    .orderBy(asc(schema.deviceType.name));
}

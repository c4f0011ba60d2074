import { asc } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import type { DeviceTypeJson } from '~/contracts/device-types';
import { toDeviceTypeRow } from './columns';

export async function listDeviceTypes({ actor }: { actor: Actor | null }): Promise<DeviceTypeJson[]> {
  requirePermission(actor, 'deviceTypes:read');
  const rows = await getDb().select().from(schema.deviceType).orderBy(asc(schema.deviceType.name));
  return rows.map(toDeviceTypeRow);
}

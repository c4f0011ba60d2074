import { eq } from 'drizzle-orm';
import { DeviceTypeInput, type DeviceTypeJson } from '~/contracts/device-types';
import { getDb, schema } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { toColumns, toDeviceTypeRow } from './columns';

export async function createDeviceType({ actor, input }: { actor: Actor | null; input: unknown }): Promise<DeviceTypeJson> {
  requirePermission(actor, 'deviceTypes:manage');
  const data = DeviceTypeInput.parse(input);
  return getDb().transaction(async (tx) => {
    const existing = await tx.select({ id: schema.deviceType.id }).from(schema.deviceType).where(eq(schema.deviceType.name, data.name));
    if (existing.length) throw new AppError('device_type_exists', { name: data.name });
    const [row] = await tx.insert(schema.deviceType).values(toColumns(data)).returning();
    await writeAudit(tx, actor, { action: 'device_type.create', subjectType: 'device_type', subjectId: row.id, after: data });
    return toDeviceTypeRow(row);
  });
}

import { and, count, eq, ne } from 'drizzle-orm';
import { z } from 'zod';
import { DeviceTypeInput, type DeviceTypeJson } from '~/contracts/device-types';
import { getDb, schema } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { toColumns, toDeviceTypeRow } from './columns';

/**
 * Edits a device type. The channel cannot change once parts of the type exist: their sweeps
 * were read with it. A new test VDS applies to fits made from then on.
 */
export async function updateDeviceType({ actor, id, input }: { actor: Actor | null; id: unknown; input: unknown }): Promise<DeviceTypeJson> {
  requirePermission(actor, 'deviceTypes:manage');
  const typeId = z.coerce.number().int().positive().parse(id);
  const data = DeviceTypeInput.parse(input);
  return getDb().transaction(async (tx) => {
    const [before] = await tx.select().from(schema.deviceType).where(eq(schema.deviceType.id, typeId)).for('update');
    if (!before) throw new AppError('device_type_id_not_found', { id: typeId });
    const clash = await tx
      .select({ id: schema.deviceType.id })
      .from(schema.deviceType)
      .where(and(eq(schema.deviceType.name, data.name), ne(schema.deviceType.id, typeId)));
    if (clash.length) throw new AppError('device_type_name_taken', { name: data.name });
    if (data.channel !== before.channel) {
      const [{ n }] = await tx.select({ n: count() }).from(schema.part).where(eq(schema.part.deviceTypeId, typeId));
      if (n > 0) {
        throw new AppError('device_type_channel_fixed', { name: before.name, parts: n, channel: before.channel });
      }
    }
    const [row] = await tx.update(schema.deviceType).set(toColumns(data)).where(eq(schema.deviceType.id, typeId)).returning();
    await writeAudit(tx, actor, { action: 'device_type.update', subjectType: 'device_type', subjectId: typeId, before: toDeviceTypeRow(before), after: toDeviceTypeRow(row) });
    return toDeviceTypeRow(row);
  });
}

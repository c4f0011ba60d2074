import { eq } from 'drizzle-orm';
import { schema, type DbOrTx } from '~/db/client';
import { AppError } from '~/lib/server/errors';

export type DeviceTypeRow = typeof schema.deviceType.$inferSelect;

/** A device type by its id ("3") or its name ("WS-N30"); not_found names what was asked for. */
export async function findDeviceType(tx: DbOrTx, ref: string | number): Promise<DeviceTypeRow> {
  const text = String(ref).trim();
  const rows = /^\d+$/.test(text)
    ? await tx.select().from(schema.deviceType).where(eq(schema.deviceType.id, Number(text)))
    : await tx.select().from(schema.deviceType).where(eq(schema.deviceType.name, text));
  if (!rows[0]) {
    throw new AppError('device_type_ref_not_found', { ref: text });
  }
  return rows[0];
}

import { getDb, schema } from '~/db/client';

export type DeviceTypeRecord = typeof schema.deviceType.$inferSelect;

const TTL_MS = 5_000;
let cached: { at: number; byName: Map<string, DeviceTypeRecord> } | undefined;

/**
 * Device types by name (case-insensitive), re-read at most every 5 s: a worker fits
 * thousands of files a minute and the table changes by hand a few times a year.
 */
export async function deviceTypesByName(): Promise<Map<string, DeviceTypeRecord>> {
  if (cached && Date.now() - cached.at < TTL_MS) return cached.byName;
  const rows = await getDb().select().from(schema.deviceType);
  cached = { at: Date.now(), byName: new Map(rows.map((r) => [r.name.toLowerCase(), r])) };
  return cached.byName;
}

export function forgetDeviceTypes(): void {
  cached = undefined;
}

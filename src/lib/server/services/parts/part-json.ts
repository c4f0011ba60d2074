import type { PartJson } from '~/contracts/parts';
import type { schema } from '~/db/client';

/** The rows a part's JSON is made from (the part with its type, lot, bin and location, each as far as needed). */
export interface PartJsonRow {
  part: Pick<typeof schema.part.$inferSelect, 'serial' | 'status'>;
  type: Pick<typeof schema.deviceType.$inferSelect, 'name' | 'channel'>;
  lot: Pick<typeof schema.lot.$inferSelect, 'code'> | null;
  bin: Pick<typeof schema.bin.$inferSelect, 'code' | 'label'> | null;
  location: Pick<typeof schema.location.$inferSelect, 'name'> | null;
}

/** A part as every response names it: serial, channel, status, type, lot, bin and location. */
export function partJson({ part, type, lot, bin, location }: PartJsonRow): PartJson {
  return {
    serial: part.serial,
    channel: type.channel,
    status: part.status,
    device_type: type.name,
    lot: lot?.code ?? null,
    bin_code: bin?.code ?? null,
    bin_label: bin?.label ?? null,
    location: location?.name ?? null,
  };
}

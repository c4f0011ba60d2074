import { eq, or, sql } from 'drizzle-orm';
import { LocationInput, LocationPatch, type LocationDeleted, type LocationRecord } from '~/contracts/locations';
import { getDb, schema, type DbOrTx } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { barcodeFromName } from './barcode-from-name';

/** A stored location as creating and changing it answer. */
function locationRecord(row: typeof schema.location.$inferSelect): LocationRecord {
  return { id: row.id, name: row.name, barcode: row.barcode, description: row.description, createdAt: row.createdAt.toISOString() };
}

async function assertFree(tx: DbOrTx, name: string | undefined, barcode: string | undefined, exceptId?: number) {
  const clash = await tx
    .select({ id: schema.location.id, name: schema.location.name, barcode: schema.location.barcode })
    .from(schema.location)
    .where(or(name ? eq(schema.location.name, name) : sql`false`, barcode ? eq(schema.location.barcode, barcode) : sql`false`));
  const other = clash.find((c) => c.id !== exceptId);
  if (other) {
    const what = other.name === name ? `the name "${name}"` : `the barcode ${barcode}`;
    throw new AppError('location_taken', { name: other.name, what });
  }
}

export async function createLocation({ actor, input }: { actor: Actor | null; input: unknown }): Promise<LocationRecord> {
  requirePermission(actor, 'locations:manage');
  const data = LocationInput.parse(input);
  const barcode = data.barcode ?? barcodeFromName(data.name);
  return getDb().transaction(async (tx) => {
    await assertFree(tx, data.name, barcode);
    const [row] = await tx.insert(schema.location).values({ name: data.name, barcode, description: data.description }).returning();
    await writeAudit(tx, actor, { action: 'location.create', subjectType: 'location', subjectId: row.id, after: row });
    return locationRecord(row);
  });
}

export async function updateLocation({ actor, id, input }: { actor: Actor | null; id: number; input: unknown }): Promise<LocationRecord> {
  requirePermission(actor, 'locations:manage');
  const data = LocationPatch.parse(input);
  return getDb().transaction(async (tx) => {
    const [before] = await tx.select().from(schema.location).where(eq(schema.location.id, id)).for('update');
    if (!before) throw new AppError('location_not_found', { id });
    await assertFree(tx, data.name, data.barcode, id);
    const [row] = await tx.update(schema.location).set(data).where(eq(schema.location.id, id)).returning();
    await writeAudit(tx, actor, { action: 'location.update', subjectType: 'location', subjectId: id, before, after: row });
    return locationRecord(row);
  });
}

/** Deletes an unused location; one that is a bin's home or holds parts is refused. */
export async function deleteLocation({ actor, id }: { actor: Actor | null; id: number }): Promise<LocationDeleted> {
  requirePermission(actor, 'locations:manage');
  return getDb().transaction(async (tx) => {
    const [before] = await tx.select().from(schema.location).where(eq(schema.location.id, id)).for('update');
    if (!before) throw new AppError('location_not_found', { id });
    const [use] = await tx
      .select({
        bins: sql<number>`(select count(*)::int from ${schema.bin} where home_location_id = ${id})`,
        parts: sql<number>`(select count(*)::int from ${schema.part} where location_id = ${id})`,
        picks: sql<number>`(select count(*)::int from ${schema.pickLine} where location_id = ${id})`,
      })
      .from(sql`(select 1) as one`);
    if (use.bins + use.parts + use.picks > 0) {
      throw new AppError('location_in_use', { name: before.name, bins: use.bins, parts: use.parts, picks: use.picks });
    }
    await tx.delete(schema.location).where(eq(schema.location.id, id));
    await writeAudit(tx, actor, { action: 'location.delete', subjectType: 'location', subjectId: id, before });
    return { deleted: id };
  });
}

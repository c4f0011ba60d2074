import { eq } from 'drizzle-orm';
import { CreateLotInput, type LotCreated } from '~/contracts/lots';
import { getDb, schema } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';

export async function createLot({ actor, input }: { actor: Actor | null; input: unknown }): Promise<LotCreated> {
  requirePermission(actor, 'lots:create');
  const data = CreateLotInput.parse(input);
  return getDb().transaction(async (tx) => {
    const [type] = await tx.select().from(schema.deviceType).where(eq(schema.deviceType.name, data.device_type));
    if (!type) {
      const known = await tx.select({ name: schema.deviceType.name }).from(schema.deviceType);
      throw new AppError('device_type_unknown', { name: data.device_type, known: known.map((k) => k.name) });
    }
    const clash = await tx.select({ id: schema.lot.id }).from(schema.lot).where(eq(schema.lot.code, data.code));
    if (clash.length) throw new AppError('lot_exists', { code: data.code });
    const [row] = await tx
      .insert(schema.lot)
      .values({ code: data.code, deviceTypeId: type.id, supplier: data.supplier, notes: data.notes, receivedAt: data.received_at ?? new Date(), createdBy: actor.userId })
      .returning();
    await writeAudit(tx, actor, { action: 'lot.create', subjectType: 'lot', subjectId: data.code, after: { device_type: type.name, supplier: data.supplier } });
    return { id: row.id, code: row.code, device_type: type.name, supplier: row.supplier, notes: row.notes, received_at: row.receivedAt.toISOString() };
  });
}

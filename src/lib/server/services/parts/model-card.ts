import { eq } from 'drizzle-orm';
import { formatModelCard, modelCardName } from '~/core/fit/model-card';
import { getDb, schema } from '~/db/client';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';

/**
 * The part's SPICE .model card from its current fit, with comment lines saying where it came
 * from, and a file name for the download.
 */
export async function getPartModelCard({ actor, serial }: { actor: Actor | null; serial: string }) {
  requirePermission(actor, 'parts:read');
  const db = getDb();
  const [row] = await db
    .select({ part: schema.part, type: schema.deviceType, fit: schema.fit, sweep: schema.sweep })
    .from(schema.part)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .leftJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
    .leftJoin(schema.sweep, eq(schema.sweep.id, schema.fit.sweepId))
    .where(eq(schema.part.serial, serial));
  if (!row) throw new AppError('part_not_found', { serial });
  if (!row.fit) throw new AppError('part_has_no_model_card', { serial });
  const { part, type, fit, sweep } = row;
  const card = formatModelCard({
    serial: part.serial,
    channel: type.channel,
    params: { vtoV: fit.vtoV, betaAPerV2: fit.betaAPerV2, lambdaPerV: fit.lambdaPerV, rsOhm: fit.rsOhm, rdOhm: fit.rdOhm },
    temperatureC: sweep?.temperatureC ?? null,
  });
  const lines = [
    `* ${part.serial} (${type.name}, ${type.channel.toUpperCase()}-channel), SPICE level-1 JFET fitted by Sluice`,
    `* fit ${fit.id} of ${fit.createdAt.toISOString()}, model ${fit.model}, ${fit.engineVersion}`,
    `* status at download: ${part.status}${fit.flags.length ? `; flags: ${fit.flags.join(', ')}` : ''}`,
    card,
    '',
  ];
  return { text: lines.join('\n'), fileName: `${modelCardName(part.serial)}.lib` };
}

import { eq, inArray } from 'drizzle-orm';
import { permissionsOf } from '~/lib/access';
import { getDb, schema } from '~/db/client';
import type { Actor } from '../identity';
import { ingestStoredFile } from '../services/intake/ingest-stored-file';
import { randomPartParams, simulateSweepCsv, type Defect } from '~/core/intake/simulated-sweep';
import { seededRandom } from '~/core/random/seeded-random';
import { createLot } from '../services/lots/create';
import { receiveSweepUpload } from '../services/uploads/receive';

/** Four invented incoming lots of the demo's two types, with a few deliberately doubtful parts. */
export const DEMO_LOTS = [
  { code: 'WS-N30-2611A', deviceType: 'WS-N30', channel: 'n' as const, parts: 80, supplier: 'Weir Street Components', seed: 2611 },
  { code: 'WS-N30-2611B', deviceType: 'WS-N30', channel: 'n' as const, parts: 80, supplier: 'Weir Street Components', seed: 2612 },
  { code: 'WS-N30-2612A', deviceType: 'WS-N30', channel: 'n' as const, parts: 80, supplier: 'Millrace Semiconductor', seed: 2613 },
  { code: 'WS-P12-2611A', deviceType: 'WS-P12', channel: 'p' as const, parts: 80, supplier: 'Weir Street Components', seed: 2614 },
];

/** Which parts of each lot carry a defect: a handful, so the review queue has work in it. */
function defectFor(index: number): Defect {
  if (index === 7 || index === 41) return 'self_heating';
  if (index === 23 || index === 66) return 'breakdown';
  return 'none';
}

/**
 * Loads the demo lots through the same path as a real upload: each part's sweep is simulated
 * from the level-1 model (0.3 % noise, 9 gate steps × 41 VDS points over 0–15 V), written as a
 * long-format CSV, stored under uploads/ by SHA-256 and fitted by `ingestStoredFile`. Skips
 * lots that already exist.
 */
export async function seedDemoLots(): Promise<number> {
  const db = getDb();
  const existing = await db.select({ code: schema.lot.code }).from(schema.lot).where(inArray(schema.lot.code, DEMO_LOTS.map((l) => l.code)));
  const have = new Set(existing.map((e) => e.code));
  const todo = DEMO_LOTS.filter((l) => !have.has(l.code));
  if (todo.length === 0) return 0;

  const [inspector] = await db.select({ id: schema.user.id, email: schema.user.email }).from(schema.user).where(eq(schema.user.email, 'inspector@demo.sluice.test'));
  const actor: Actor = { userId: inspector?.id ?? null, stationId: null, label: inspector?.email ?? 'demo seed', permissions: permissionsOf(['inspector']) };

  let parts = 0;
  for (const lot of todo) {
    await createLot({ actor, input: { code: lot.code, device_type: lot.deviceType, supplier: lot.supplier, notes: 'Invented demo lot.' } });
    const rand = seededRandom(lot.seed);
    const files = Array.from({ length: lot.parts }, (_, i) => {
      const serial = `${lot.code.replace(/^WS-/, '')}-${String(i + 1).padStart(3, '0')}`;
      const text = simulateSweepCsv({
        serial,
        channel: lot.channel,
        params: randomPartParams(rand),
        deviceType: lot.deviceType,
        lot: lot.code,
        temperatureC: 24 + 2 * rand(),
        station: 'Tracer bench 1',
        operator: 'ib',
        defect: defectFor(i),
        rand,
      });
      return { name: `${serial}.csv`, bytes: new TextEncoder().encode(text) };
    });
    const received = await receiveSweepUpload({ actor, files, tags: {}, queue: false });
    for (const f of received.files) {
      await ingestStoredFile(f.id);
      parts++;
    }
  }
  return parts;
}

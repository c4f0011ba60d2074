/**
 * Parts with accepted fits written straight into the test database, the way intake leaves
 * them (part accepted, sweep, fit with figure columns, binned by assignBinsForParts), so the
 * stock tests do not depend on the upload path.
 */
import { randomBytes } from 'node:crypto';
import { eq, inArray } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { assignBinsForParts } from '~/lib/server/services/bins/assign-bins';

export function uniqueName(prefix: string): string {
  return `${prefix}-${randomBytes(3).toString('hex').toUpperCase()}`;
}

export async function createTestType(channel: 'n' | 'p' = 'n'): Promise<{ id: number; name: string }> {
  const name = uniqueName(channel === 'n' ? 'TN' : 'TP');
  const [row] = await getDb()
    .insert(schema.deviceType)
    .values({ name, channel, vdsTestV: 10, description: 'test type' })
    .returning({ id: schema.deviceType.id, name: schema.deviceType.name });
  return row;
}

export interface Figures {
  idssA: number;
  vpV: number;
}

const LAMBDA = 0.01;
const VDS = 10;

/**
 * Inserts accepted parts whose fits give exactly these figures: VTO = VP (N-channel) and
 * BETA = IDSS / (VTO²·(1 + λ·VDS)), from the level-1 IDSS formula. Returns id and serial.
 */
export async function createAcceptedParts(
  typeId: number,
  figures: Figures[],
  { lotId = null, prefix = uniqueName('S'), bin = true }: { lotId?: number | null; prefix?: string; bin?: boolean } = {},
): Promise<{ id: number; serial: string; idssA: number; vpV: number }[]> {
  const db = getDb();
  const out: { id: number; serial: string; idssA: number; vpV: number }[] = [];
  await db.transaction(async (tx) => {
    for (let i = 0; i < figures.length; i++) {
      const f = figures[i];
      const serial = `${prefix}-${String(i).padStart(3, '0')}`;
      const [p] = await tx.insert(schema.part).values({ serial, deviceTypeId: typeId, lotId, status: 'accepted' }).returning({ id: schema.part.id });
      const [s] = await tx
        .insert(schema.sweep)
        .values({ partId: p.id, vgsStepsV: [0, -0.5, -1], curves: [], pointCount: 0 })
        .returning({ id: schema.sweep.id });
      const vto = -Math.abs(f.vpV);
      const beta = f.idssA / (vto * vto * (1 + LAMBDA * VDS));
      const [fit] = await tx
        .insert(schema.fit)
        .values({
          sweepId: s.id,
          partId: p.id,
          model: 'level1',
          engineVersion: 'test',
          vtoV: vto,
          betaAPerV2: beta,
          lambdaPerV: LAMBDA,
          idssA: f.idssA,
          idssVdsV: VDS,
          vpV: f.vpV,
          gfsS: (2 * f.idssA) / Math.abs(f.vpV),
          gosS: LAMBDA * f.idssA,
          rdsOnOhm: Math.abs(f.vpV) / (2 * f.idssA),
          rmsRel: 0.001,
          detail: {},
          review: 'auto_accepted',
        })
        .returning({ id: schema.fit.id });
      await tx.update(schema.part).set({ currentFitId: fit.id }).where(eq(schema.part.id, p.id));
      out.push({ id: p.id, serial, ...f });
    }
    if (bin) await assignBinsForParts(tx, null, out.map((p) => p.id));
  });
  return out;
}

export async function partsBySerial(serials: string[]) {
  const rows = await getDb()
    .select({ id: schema.part.id, serial: schema.part.serial, status: schema.part.status, binId: schema.part.binId, locationId: schema.part.locationId, binCode: schema.bin.code, planId: schema.bin.binPlanId })
    .from(schema.part)
    .leftJoin(schema.bin, eq(schema.bin.id, schema.part.binId))
    .where(inArray(schema.part.serial, serials));
  return new Map(rows.map((r) => [r.serial, r]));
}

/** IDSS 2–10 mA in 2 mA steps × VP −4 to 0 V in 1 V steps: 16 bins and hold. */
export const COARSE_PLAN = {
  axes: [
    { quantity: 'idss', edges: { kind: 'uniform', startValue: 2e-3, width: 2e-3, count: 4 } },
    { quantity: 'vp', edges: { kind: 'uniform', startValue: -4, width: 1, count: 4 } },
  ],
};

/** One bin for everything from 1 to 21 mA: all parts of a test land in the same bin. */
export const ONE_BIN_PLAN = { axes: [{ quantity: 'idss', edges: { kind: 'uniform', startValue: 1e-3, width: 20e-3, count: 1 } }] };

import { afterAll, describe, expect, it } from 'vitest';
import { eq, inArray } from 'drizzle-orm';
import { closeDb, getDb, schema } from '~/db/client';
import type { Actor } from '~/lib/server/identity';
import { ingestStoredFiles } from '~/lib/server/services/intake/ingest-stored-file';
import { simulateSweepCsv } from '~/core/intake/simulated-sweep';
import { seededRandom } from '~/core/random/seeded-random';
import { receiveSweepUpload } from '~/lib/server/services/uploads/receive';

/**
 * The fitting job stores a batch of files a few transactions at a time. These drive the
 * service directly (files recorded without a queued job, so the test script's worker leaves
 * them alone) with batches that must not be stored as one group: a retest of a serial in the
 * same batch, the same bytes twice, and a file that storing refuses among good ones.
 */

const RUN = Date.now().toString(36).slice(-5).toUpperCase();
const station: Actor = { userId: null, stationId: null, label: 'batch test', permissions: ['sweeps:upload'] };
const N = { vtoV: -1.9, betaAPerV2: 1.8e-3, lambdaPerV: 0.012, rsOhm: 0, rdOhm: 0 };

function file(serial: string, seed: number, deviceType = 'WS-N30', channel: 'n' | 'p' = 'n') {
  return { name: `${serial}-${seed}.csv`, bytes: new TextEncoder().encode(simulateSweepCsv({ serial, channel, params: N, deviceType, temperatureC: 25 + seed, rand: seededRandom(seed) })) };
}

async function receive(files: ReturnType<typeof file>[]) {
  const r = await receiveSweepUpload({ actor: station, files, tags: {}, queue: false });
  return r.files.map((f) => f.id);
}

afterAll(async () => {
  await closeDb();
});

describe('one batch of fitting jobs', () => {
  it('stores a retest of a serial after the sweep it follows, both in the same batch', async () => {
    const serial = `BT-${RUN}-1`;
    const ids = await receive([file(serial, 1), file(`BT-${RUN}-2`, 2), file(serial, 3)]);
    const outcomes = await ingestStoredFiles(ids);
    expect(outcomes.map((o) => o.state)).toEqual(['fitted', 'fitted', 'fitted']);
    expect(outcomes.map((o) => o.uploadFileId)).toEqual(ids);
    const [part] = await getDb().select().from(schema.part).where(eq(schema.part.serial, serial));
    const sweeps = await getDb().select().from(schema.sweep).where(eq(schema.sweep.partId, part.id)).orderBy(schema.sweep.id);
    expect(sweeps.map((s) => s.uploadFileId)).toEqual([ids[0], ids[2]]);
    const [current] = await getDb().select().from(schema.fit).where(eq(schema.fit.id, part.currentFitId!));
    expect(current.sweepId).toBe(sweeps[1].id);
    expect(part.status).toBe('accepted');
  });

  it('the same bytes twice in one request make one sweep; the copy points at the first', async () => {
    const f = file(`BT-${RUN}-3`, 4);
    const ids = await receive([f, { ...f, name: 'copy.csv' }]);
    const rows = await getDb().select().from(schema.uploadFile).where(inArray(schema.uploadFile.id, ids)).orderBy(schema.uploadFile.id);
    expect(rows[1].duplicateOfId).toBe(rows[0].id);
    const outcomes = await ingestStoredFiles(ids);
    expect(outcomes[0]).toMatchObject({ state: 'fitted', serials: [`BT-${RUN}-3`] });
    const sweeps = await getDb().select().from(schema.sweep).where(inArray(schema.sweep.uploadFileId, ids));
    expect(sweeps).toHaveLength(1);
  });

  it('a file that storing refuses is rejected with its reason; the rest of the batch lands', async () => {
    const known = `BT-${RUN}-4`;
    await ingestStoredFiles(await receive([file(known, 5)]));
    // The same serial now claimed as a P-channel type: refused when the parts are stored.
    const ids = await receive([file(`BT-${RUN}-5`, 6), file(known, 7, 'WS-P12', 'p'), file(`BT-${RUN}-6`, 8)]);
    const outcomes = await ingestStoredFiles(ids);
    expect(outcomes.map((o) => o.state)).toEqual(['fitted', 'rejected', 'fitted']);
    expect(outcomes[1].reason).toContain(`part ${known} is already known as another device type, not WS-P12`);
    const sweeps = await getDb().select().from(schema.sweep).where(inArray(schema.sweep.uploadFileId, ids));
    expect(sweeps.map((s) => s.uploadFileId).sort()).toEqual([ids[0], ids[2]].sort());
    const [rejected] = await getDb().select().from(schema.uploadFile).where(eq(schema.uploadFile.id, ids[1]));
    expect(rejected).toMatchObject({ state: 'rejected', errorCode: 'type_conflict' });
  });

  it('running the batch again changes nothing', async () => {
    const ids = await receive([file(`BT-${RUN}-7`, 9), file(`BT-${RUN}-8`, 10)]);
    const first = await ingestStoredFiles(ids);
    const again = await ingestStoredFiles(ids);
    expect(again).toEqual(first);
    const sweeps = await getDb().select().from(schema.sweep).where(inArray(schema.sweep.uploadFileId, ids));
    expect(sweeps).toHaveLength(2);
  });
});

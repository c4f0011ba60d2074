import { afterAll, describe, expect, it, vi } from 'vitest';
import { inArray } from 'drizzle-orm';
import { closeDb, getDb, schema } from '~/db/client';
import type { Actor } from '~/lib/server/identity';
import { getBoss, JOB_EXPIRE_SECONDS, QUEUES, stopBoss } from '~/lib/server/jobs/boss';
import { fitUploadFiles } from '~/lib/server/jobs/fit-upload-file';
import { JobFailure } from '~/lib/server/jobs/job-failure';
import { simulateSweepCsv } from '~/core/intake/simulated-sweep';
import { seededRandom } from '~/core/random/seeded-random';
import { receiveSweepUpload } from '~/lib/server/services/uploads/receive';

/**
 * Issue 12, finding 1: a failure whose text PostgreSQL cannot store (a NUL byte, a lone
 * surrogate) must still be recorded. Here the fitter is made to throw such an error on
 * 6-step families; PostgreSQL's refusal of U+0000 in text and jsonb is its documented
 * behaviour ("Character Types", "JSON Types").
 */
vi.mock('~/core/fit/fit-curve-family', async (importOriginal) => {
  const real = await importOriginal<typeof import('~/core/fit/fit-curve-family')>();
  return {
    ...real,
    fitCurveFamily: (family: Parameters<typeof real.fitCurveFamily>[0], options: Parameters<typeof real.fitCurveFamily>[1]) => {
      if (family.curves.length === 6) throw new Error(`fitter broke on "a\u0000b" \uD800 ${'x'.repeat(5000)}`, { cause: new Error('inner\u0000cause') });
      return real.fitCurveFamily(family, options);
    },
  };
});

const RUN = Date.now().toString(36).slice(-5).toUpperCase();
const station: Actor = { userId: null, stationId: null, label: 'storable failure test', permissions: ['sweeps:upload'] };
const N = { vtoV: -2.1, betaAPerV2: 1.6e-3, lambdaPerV: 0.014, rsOhm: 0, rdOhm: 0 };
const file = (serial: string, gateSteps: number) => ({
  name: `${serial}.csv`,
  bytes: new TextEncoder().encode(simulateSweepCsv({ serial, channel: 'n', params: N, deviceType: 'WS-N30', gateSteps, rand: seededRandom(gateSteps) })),
});
const job = (uploadFileId: number, retryCount: number) =>
  ({ id: crypto.randomUUID(), name: 'fit-upload-file', data: { uploadFileId }, retryCount, retryLimit: 3 }) as unknown as Parameters<typeof fitUploadFiles>[0][number];

afterAll(async () => {
  await stopBoss();
  await closeDb();
});

describe('a job failure whose text PostgreSQL cannot store', () => {
  it('on the last attempt the file is rejected with a stored reason, and the thrown error is storable', async () => {
    const r = await receiveSweepUpload({ actor: station, files: [file(`NUL-${RUN}-1`, 6), file(`NUL-${RUN}-2`, 9)], tags: {}, queue: false });
    const [bad, good] = r.files.map((f) => f.id);
    const thrown = await fitUploadFiles([job(bad, 3), job(good, 3)]).then(
      () => null,
      (e: unknown) => e,
    );
    expect(thrown).toBeInstanceOf(JobFailure);
    const failure = thrown as JobFailure;
    expect(failure.message).toContain('fitter broke on "a\u2400b" \uFFFD');
    expect(failure.message).not.toMatch(/\u0000/);
    expect(failure.message.length).toBeLessThanOrEqual(2000);

    const rows = await getDb().select().from(schema.uploadFile).where(inArray(schema.uploadFile.id, [bad, good])).orderBy(schema.uploadFile.id);
    expect(rows.map((f) => f.state)).toEqual(['rejected', 'fitted']);
    expect(rows[0].errorCode).toBe('internal_error');
    expect(rows[0].reason).toContain(`NUL-${RUN}-1.csv: could not be fitted after repeated attempts — internal error: upload file(s) ${bad} could not be ingested: fitter broke on "a\u2400b" \uFFFD`);
  });

  it('a fitting job that fails every attempt, by an error or by a worker that died, lands in the dead-letter queue and its file is refused', async () => {
    const r = await receiveSweepUpload({ actor: station, files: [file(`DL-${RUN}-1`, 9), file(`DL-${RUN}-2`, 8)], tags: {}, queue: false });
    const [byError, byDeath] = r.files.map((f) => f.id);
    const boss = await getBoss();
    // Held back an hour so that the suite's running worker does not take them; fetched here
    // first (highest priority) as a worker would.
    const later = new Date(Date.now() + 3600_000);
    await boss.send(QUEUES.fitUploadFile, { uploadFileId: byError }, { retryLimit: 0, priority: 1000, startAfter: later });
    await boss.send(QUEUES.fitUploadFile, { uploadFileId: byDeath }, { retryLimit: 0, priority: 1000, startAfter: later, expireInSeconds: 1 });
    const jobs = await boss.fetch<{ uploadFileId: number }>(QUEUES.fitUploadFile, { batchSize: 2, ignoreStartAfter: true });
    expect(jobs.map((j) => j.data.uploadFileId).sort()).toEqual([byError, byDeath].sort());
    const failing = jobs.find((j) => j.data.uploadFileId === byError)!;
    await boss.fail(QUEUES.fitUploadFile, failing.id, new JobFailure(QUEUES.fitUploadFile, new Error('fitter broke for good')));
    // The other job is never finished, as if its worker had been killed: pg-boss expires it.

    const reasons = async () =>
      (await getDb().select().from(schema.uploadFile).where(inArray(schema.uploadFile.id, [byError, byDeath])).orderBy(schema.uploadFile.id)).map((f) => [f.state, f.reason]);
    for (let i = 0; i < 120 && (await reasons()).some(([state]) => state !== 'rejected'); i++) await new Promise((res) => setTimeout(res, 250));
    const byId = new Map((await getDb().select().from(schema.uploadFile).where(inArray(schema.uploadFile.id, [byError, byDeath]))).map((f) => [f.id, f]));
    expect(byId.get(byError)).toMatchObject({ state: 'rejected', errorCode: 'internal_error' });
    expect(byId.get(byError)!.reason).toContain(`DL-${RUN}-1.csv: could not be fitted after repeated attempts — internal error: fit-upload-file: fitter broke for good.`);
    expect(byId.get(byDeath)).toMatchObject({ state: 'rejected', errorCode: 'internal_error' });
    expect(byId.get(byDeath)!.reason).toContain(
      `DL-${RUN}-2.csv: could not be fitted after repeated attempts — internal error: the worker fitting it stopped, or took longer than ${JOB_EXPIRE_SECONDS} s, on every attempt.`,
    );
  });

  it('pg-boss stores the failure the worker hands it (the write that used to end the worker)', async () => {
    const boss = await getBoss();
    const queue = `storable-failure-${RUN.toLowerCase()}`;
    await boss.createQueue(queue);
    const id = await boss.send(queue, { n: 1 }, { retryLimit: 0 });
    const [fetched] = await boss.fetch(queue);
    expect(fetched.id).toBe(id);
    const raw = new Error('raw \u0000 text', { cause: new Error('inner\u0000') });
    // The unsanitized error is refused by PostgreSQL: this is the failure the worker died of.
    await expect(boss.fail(queue, fetched.id, raw)).rejects.toThrow();
    await boss.fail(queue, fetched.id, new JobFailure(queue, raw));
    const stored = await boss.getJobById(queue, fetched.id);
    expect(stored?.state).toBe('failed');
    expect((stored?.output as { message: string }).message).toBe(`${queue}: raw \u2400 text (cause: inner\u2400)`);
  });
});

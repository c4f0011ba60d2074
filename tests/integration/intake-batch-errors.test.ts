import { afterAll, describe, expect, it, vi } from 'vitest';
import { inArray } from 'drizzle-orm';
import { closeDb, getDb, schema } from '~/db/client';
import type { Actor } from '~/lib/server/identity';
import { fitUploadFiles } from '~/lib/server/jobs/fit-upload-file';
import { ingestStoredFiles } from '~/lib/server/services/intake/ingest-stored-file';
import { simulateSweepCsv } from '~/core/intake/simulated-sweep';
import { seededRandom } from '~/core/random/seeded-random';
import { receiveSweepUpload } from '~/lib/server/services/uploads/receive';

/**
 * An unexpected error while fitting one file of a batch (here a fitter made to throw on
 * 7-step families) must not hold up the others: they are stored, the error is thrown after,
 * and the file stays queued for the job's retry.
 */
vi.mock('~/core/fit/fit-curve-family', async (importOriginal) => {
  const real = await importOriginal<typeof import('~/core/fit/fit-curve-family')>();
  return {
    ...real,
    fitCurveFamily: (family: Parameters<typeof real.fitCurveFamily>[0], options: Parameters<typeof real.fitCurveFamily>[1]) => {
      if (family.curves.length === 7) throw new TypeError('simulated fault in the fitter');
      return real.fitCurveFamily(family, options);
    },
  };
});

const RUN = Date.now().toString(36).slice(-5).toUpperCase();
const station: Actor = { userId: null, stationId: null, label: 'batch error test', permissions: ['sweeps:upload'] };
const N = { vtoV: -2.1, betaAPerV2: 1.6e-3, lambdaPerV: 0.014, rsOhm: 0, rdOhm: 0 };
const file = (serial: string, gateSteps: number) => ({
  name: `${serial}.csv`,
  bytes: new TextEncoder().encode(simulateSweepCsv({ serial, channel: 'n', params: N, deviceType: 'WS-N30', gateSteps, rand: seededRandom(gateSteps) })),
});

afterAll(async () => {
  await closeDb();
});

describe('an unexpected error on one file of a batch', () => {
  it('stores the others, then throws naming the file, which stays queued', async () => {
    const r = await receiveSweepUpload({ actor: station, files: [file(`BE-${RUN}-1`, 9), file(`BE-${RUN}-2`, 7), file(`BE-${RUN}-3`, 8)], tags: {}, queue: false });
    const ids = r.files.map((f) => f.id);
    await expect(ingestStoredFiles(ids)).rejects.toThrow(`upload file(s) ${ids[1]} could not be ingested: simulated fault in the fitter`);
    const rows = await getDb().select().from(schema.uploadFile).where(inArray(schema.uploadFile.id, ids)).orderBy(schema.uploadFile.id);
    expect(rows.map((f) => f.state)).toEqual(['fitted', 'queued', 'fitted']);
    const sweeps = await getDb().select().from(schema.sweep).where(inArray(schema.sweep.uploadFileId, ids));
    expect(sweeps.map((s) => s.uploadFileId).sort()).toEqual([ids[0], ids[2]].sort());
  });

  it('on the last attempt of its job the file is refused with the error instead of staying queued', async () => {
    const r = await receiveSweepUpload({ actor: station, files: [file(`BE-${RUN}-4`, 7), file(`BE-${RUN}-5`, 7)], tags: {}, queue: false });
    const [early, last] = r.files.map((f) => f.id);
    // Shaped as pg-boss hands jobs to the handler (includeMetadata); only what the handler reads.
    const job = (uploadFileId: number, retryCount: number) =>
      ({ id: `job-${uploadFileId}`, name: 'fit-upload-file', data: { uploadFileId }, retryCount, retryLimit: 3 }) as unknown as Parameters<typeof fitUploadFiles>[0][number];
    await expect(fitUploadFiles([job(early, 1), job(last, 3)])).rejects.toThrow('simulated fault in the fitter');
    const rows = await getDb().select().from(schema.uploadFile).where(inArray(schema.uploadFile.id, [early, last])).orderBy(schema.uploadFile.id);
    expect(rows[0]).toMatchObject({ state: 'queued', errorCode: null });
    expect(rows[1]).toMatchObject({ state: 'rejected', errorCode: 'internal_error' });
    expect(rows[1].reason).toBe(
      `BE-${RUN}-5.csv: could not be fitted after repeated attempts — internal error: upload file(s) ${early}, ${last} could not be ingested: simulated fault in the fitter. The file is kept as uploaded; upload it again, and tell an admin if this recurs.`,
    );
  });
});

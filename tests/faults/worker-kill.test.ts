import type { ChildProcess } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { simulateSweepCsv } from '~/core/intake/simulated-sweep';
import { seededRandom } from '~/core/random/seeded-random';
import { signIn, type Session } from '../helpers/http';
import { query, startWeb, startWorker, stop, waitFor } from './harness';

/**
 * Issue 12: kill -9 the worker in the middle of a 500-file batch; once a worker runs again,
 * every file is fitted exactly once — none lost, none twice — and the jobs the dead worker
 * held are taken up again within a minute (pg-boss expiry, src/lib/server/jobs/boss.ts).
 */
const RUN = Date.now().toString(36).slice(-5).toUpperCase();
const FILES = 500;
const N = { vtoV: -2.0, betaAPerV2: 1.4e-3, lambdaPerV: 0.012, rsOhm: 0, rdOhm: 0 };

let web: ChildProcess;
let worker: ChildProcess | undefined;
let inspector: Session;

beforeAll(async () => {
  web = await startWeb();
  inspector = await signIn('inspector@demo.sluice.test');
});
afterAll(async () => {
  if (worker) await stop(worker);
  await stop(web);
});

async function fileStates(uploadIds: number[]) {
  return query<{ state: string; n: number }>(
    `select state, count(*)::int as n from upload_file where upload_id = any($1) group by state`,
    [uploadIds],
  );
}

describe('kill -9 of the worker in the middle of a 500-file batch', () => {
  it('fits every file exactly once after a worker runs again, the orphaned jobs within a minute', async () => {
    // Five requests of 100 files, uploaded while no worker runs: 500 jobs wait.
    const uploadIds: number[] = [];
    for (let r = 0; r < 5; r++) {
      const form = new FormData();
      for (let i = 0; i < 100; i++) {
        const serial = `KW-${RUN}-${r * 100 + i}`;
        form.append('file', new Blob([simulateSweepCsv({ serial, channel: 'n', params: N, deviceType: 'WS-N30', rand: seededRandom(r * 100 + i + 1) })]), `${serial}.csv`);
      }
      const res = await inspector.fetch('/api/sweeps', { method: 'POST', body: form });
      expect(res.status).toBe(202);
      uploadIds.push(((await res.json()) as { upload_id: number }).upload_id);
    }
    const done = async () => (await fileStates(uploadIds)).filter((s) => s.state !== 'queued').reduce((a, s) => a + s.n, 0);

    worker = await startWorker();
    await waitFor(async () => (await done()) >= 60, 120_000, 'the first files to be fitted', 50);
    worker.kill('SIGKILL');
    const killedAt = Date.now();
    await stop(worker);
    const doneAtKill = await done();
    // The dead worker's jobs stay active in pg-boss until they expire.
    const orphaned = await query<{ id: string }>(`select id from pgboss.job where name = 'fit-upload-file' and state = 'active'`);
    console.log(`[faults] killed the worker with ${doneAtKill} of ${FILES} files done and ${orphaned.length} jobs in its hands`);
    expect(doneAtKill).toBeLessThan(FILES);
    expect(orphaned.length).toBeGreaterThan(0);

    // As npm start's supervisor would: a new worker a second later.
    await new Promise((r) => setTimeout(r, 1000));
    const restartedAt = Date.now();
    worker = await startWorker();
    const ids = orphaned.map((o) => o.id);
    // The upload API says which files are being tried again once their jobs expire.
    const orphanUploads = await query<{ upload_id: string }>(
      `select distinct f.upload_id from pgboss.job j join upload_file f on f.id = (j.data->>'uploadFileId')::int where j.id = any($1::uuid[])`,
      [ids],
    );
    let seenRetry: { attempt: number; attempts: number } | null = null;
    await waitFor(
      async () => {
        const res = await inspector.fetch(`/api/uploads/${orphanUploads[0].upload_id}`);
        const body = (await res.json()) as { files: { state: string; retry: { attempt: number; attempts: number } | null }[] };
        seenRetry ??= body.files.find((f) => f.retry)?.retry ?? null;
        return seenRetry !== null || body.files.every((f) => f.state !== 'queued');
      },
      90_000,
      'the upload to show a file being retried',
      250,
    );
    // When the kill fell between storing a batch and completing its job, every file already
    // reads fitted and the upload never shows a retry; the job is retried all the same.
    const shown = seenRetry as { attempt: number; attempts: number } | null; // assigned inside the closure above
    if (shown) console.log(`[faults] the upload showed attempt ${shown.attempt} of ${shown.attempts}`);
    await waitFor(
      async () => (await query(`select 1 from pgboss.job where id = any($1::uuid[]) and state = 'completed'`, [ids])).length === ids.length,
      90_000,
      'the orphaned jobs to be done again',
      250,
    );
    // Every job the dead worker held was taken up again: expired once, completed on a later attempt.
    const retried = await query<{ retry_count: number }>(`select retry_count from pgboss.job where id = any($1::uuid[])`, [ids]);
    expect(retried).toHaveLength(ids.length);
    expect(retried.every((j) => j.retry_count >= 1)).toBe(true);
    const retriedAt = Date.now();
    await waitFor(async () => (await done()) === FILES, 90_000, 'every file to be done', 250);
    console.log(
      `[faults] orphaned jobs completed ${((retriedAt - killedAt) / 1000).toFixed(1)} s after the kill ` +
        `(${((retriedAt - restartedAt) / 1000).toFixed(1)} s after a new worker was started); all ${FILES} files done ${((Date.now() - killedAt) / 1000).toFixed(1)} s after the kill`,
    );
    expect(retriedAt - restartedAt).toBeLessThan(60_000);

    // Exactly once: every file fitted (none rejected, none still queued), one sweep, one fit and
    // one sweep audit row per file, one part per serial.
    const states = await fileStates(uploadIds);
    expect(states.filter((s) => s.state !== 'fitted' && s.state !== 'needs_review')).toEqual([]);
    const [counts] = await query<{ files: number; sweeps: number; swept_files: number; fits: number; parts: number; audits: number; max_per_file: number }>(
      `select
         (select count(*)::int from upload_file where upload_id = any($1)) as files,
         (select count(*)::int from sweep s join upload_file f on f.id = s.upload_file_id where f.upload_id = any($1)) as sweeps,
         (select count(distinct s.upload_file_id)::int from sweep s join upload_file f on f.id = s.upload_file_id where f.upload_id = any($1)) as swept_files,
         (select max(n)::int from (select count(*) as n from sweep s join upload_file f on f.id = s.upload_file_id where f.upload_id = any($1) group by s.upload_file_id) m) as max_per_file,
         (select count(*)::int from fit ft join sweep s on s.id = ft.sweep_id join upload_file f on f.id = s.upload_file_id where f.upload_id = any($1)) as fits,
         (select count(*)::int from part where serial like $2) as parts,
         (select count(*)::int from audit_log where action = 'part.sweep' and subject_id like $2) as audits`,
      [uploadIds, `KW-${RUN}-%`],
    );
    expect(counts).toEqual({ files: FILES, sweeps: FILES, swept_files: FILES, max_per_file: 1, fits: FILES, parts: FILES, audits: FILES });
  });
});

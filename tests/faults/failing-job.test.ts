import type { ChildProcess } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { simulateSweepCsv } from '~/core/intake/simulated-sweep';
import { seededRandom } from '~/core/random/seeded-random';
import { signIn, type Session } from '../helpers/http';
import { adminClient, query, startWeb, startWorker, stop, waitFor } from './harness';

/**
 * Issue 12: a job that fails on every attempt ends with its file `rejected` and a stored
 * reason, and the worker goes on with other work. The failure is real: a trigger the drill
 * puts on the sweep table refuses every sweep of files named `always-fails-*`, so storing
 * them throws inside the worker's transaction each time.
 */
const RUN = Date.now().toString(36).slice(-5).toUpperCase();
const N = { vtoV: -1.9, betaAPerV2: 1.7e-3, lambdaPerV: 0.013, rsOhm: 0, rdOhm: 0 };
const file = (name: string, serial: string, seed: number) => ({ name, text: simulateSweepCsv({ serial, channel: 'n', params: N, deviceType: 'WS-N30', rand: seededRandom(seed) }) });

let web: ChildProcess;
let worker: ChildProcess;
let inspector: Session;

async function upload(files: { name: string; text: string }[]): Promise<number[]> {
  const form = new FormData();
  for (const f of files) form.append('file', new Blob([f.text]), f.name);
  const res = await inspector.fetch('/api/sweeps', { method: 'POST', body: form });
  expect(res.status).toBe(202);
  return ((await res.json()) as { files: { id: number }[] }).files.map((f) => f.id);
}

beforeAll(async () => {
  const admin = adminClient(new URL(process.env.DATABASE_URL!).pathname.slice(1));
  await admin.connect();
  await admin.query(`
    create or replace function faults_refuse_sweep() returns trigger language plpgsql as $$
    begin
      if new.metadata->>'file_name' like 'always-fails-%' then
        raise exception 'fault drill: sweeps of % are refused', new.metadata->>'file_name';
      end if;
      return new;
    end $$;
    drop trigger if exists faults_refuse_sweep on sweep;
    create trigger faults_refuse_sweep before insert on sweep for each row execute function faults_refuse_sweep();`);
  await admin.end();
  web = await startWeb();
  worker = await startWorker();
  inspector = await signIn('inspector@demo.sluice.test');
});
afterAll(async () => {
  if (worker) await stop(worker);
  if (web) await stop(web);
  const admin = adminClient(new URL(process.env.DATABASE_URL!).pathname.slice(1));
  await admin.connect();
  await admin.query('drop trigger if exists faults_refuse_sweep on sweep');
  await admin.end();
});

describe('a job that always fails', () => {
  it('ends rejected with a stored reason after its retries, while the worker keeps fitting other files', async () => {
    const workerPid = worker.pid;
    const [bad] = await upload([file(`always-fails-${RUN}.csv`, `AF-${RUN}-0`, 1)]);
    // Good files sent while the bad one is being retried are fitted meanwhile.
    const good: number[] = [];
    for (let i = 1; i <= 3; i++) {
      await new Promise((r) => setTimeout(r, 3000));
      good.push(...(await upload([file(`fine-${RUN}-${i}.csv`, `AF-${RUN}-${i}`, i + 1)])));
    }
    const rejectedMs = await waitFor(
      async () => (await query(`select 1 from upload_file where id = $1 and state = 'rejected'`, [bad])).length === 1,
      120_000,
      'the failing file to be rejected',
      500,
    );
    const [row] = await query<{ state: string; error_code: string; reason: string }>(`select state, error_code, reason from upload_file where id = $1`, [bad]);
    expect(row.error_code).toBe('internal_error');
    expect(row.reason).toContain(`always-fails-${RUN}.csv: could not be fitted after repeated attempts — internal error:`);
    expect(row.reason).toContain(`fault drill: sweeps of always-fails-${RUN}.csv are refused`);
    const [job] = await query<{ retry_count: number; state: string }>(
      `select retry_count, state from pgboss.job where name = 'fit-upload-file' and (data->>'uploadFileId')::int = $1`,
      [bad],
    );
    expect(job).toMatchObject({ state: 'failed', retry_count: 4 });
    console.log(`[faults] the always-failing file ended rejected after 5 attempts, ${(rejectedMs / 1000).toFixed(1)} s after the last good upload`);

    await waitFor(
      async () => (await query(`select 1 from upload_file where id = any($1) and state in ('fitted', 'needs_review')`, [good])).length === good.length,
      60_000,
      'the good files to be fitted',
      500,
    );
    // The same worker, still running, takes new work after the failure.
    const after = await upload([file(`fine-${RUN}-after.csv`, `AF-${RUN}-after`, 9)]);
    await waitFor(async () => (await query(`select 1 from upload_file where id = any($1) and state in ('fitted', 'needs_review')`, [after])).length === 1, 60_000, 'a file after the failure', 250);
    expect(worker.exitCode).toBeNull();
    expect(worker.pid).toBe(workerPid);
  });
});

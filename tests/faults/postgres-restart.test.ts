import type { ChildProcess } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { simulateSweepCsv } from '~/core/intake/simulated-sweep';
import { seededRandom } from '~/core/random/seeded-random';
import { BASE_URL, signIn, type Session } from '../helpers/http';
import { query, startPostgres, startWeb, startWorker, stop, stopPostgres, waitFor } from './harness';

/**
 * Issue 12: PostgreSQL restarts (here stopped as a crash would, then started again) while
 * uploads and page loads run. The web server and the worker are not restarted: the app
 * answers again within seconds, and every upload that was accepted (202) is fitted.
 */
const RUN = Date.now().toString(36).slice(-5).toUpperCase();
const N = { vtoV: -2.3, betaAPerV2: 1.2e-3, lambdaPerV: 0.01, rsOhm: 0, rdOhm: 0 };

let web: ChildProcess;
let worker: ChildProcess;
let inspector: Session;
let designer: Session;

beforeAll(async () => {
  web = await startWeb();
  worker = await startWorker();
  inspector = await signIn('inspector@demo.sluice.test');
  designer = await signIn('designer@demo.sluice.test');
});
afterAll(async () => {
  if (worker) await stop(worker);
  if (web) await stop(web);
});

describe('a PostgreSQL restart under load', () => {
  it('the app answers again within seconds without a restart, and no accepted upload is lost', async () => {
    const webPid = web.pid;
    const workerPid = worker.pid;
    const accepted: number[] = [];
    const refused: number[] = [];
    let n = 0;
    let running = true;
    const uploads = (async () => {
      while (running) {
        const serial = `PR-${RUN}-${n++}`;
        const form = new FormData();
        form.append('file', new Blob([simulateSweepCsv({ serial, channel: 'n', params: N, deviceType: 'WS-N30', rand: seededRandom(n) })]), `${serial}.csv`);
        const res = await inspector.fetch('/api/sweeps', { method: 'POST', body: form }).catch(() => null);
        if (res?.status === 202) accepted.push(((await res.json()) as { upload_id: number }).upload_id);
        else refused.push(res?.status ?? 0);
        await new Promise((r) => setTimeout(r, 100));
      }
    })();
    const pageStatuses: number[] = [];
    const pages = (async () => {
      while (running) {
        for (const path of ['/parts', '/api/parts?page=1', '/api/bins']) {
          const res = await designer.fetch(path).catch(() => null);
          pageStatuses.push(res?.status ?? 0);
          await res?.arrayBuffer().catch(() => null);
        }
        await new Promise((r) => setTimeout(r, 100));
      }
    })();

    await waitFor(() => accepted.length >= 5, 60_000, 'a few uploads before the restart');
    stopPostgres();
    const downAt = Date.now();
    await new Promise((r) => setTimeout(r, 2000));
    startPostgres();
    const upAt = Date.now();
    // The first full answer of a page that reads the database, after PostgreSQL is back.
    const answerMs = await waitFor(
      async () => {
        const res = await designer.fetch('/api/parts?page=1').catch(() => null);
        return res?.status === 200;
      },
      30_000,
      'the app to answer after the restart',
      100,
    );
    const acceptedBefore = accepted.length;
    await waitFor(() => accepted.length >= acceptedBefore + 5, 60_000, 'uploads to be accepted again');
    running = false;
    await Promise.all([uploads, pages]);
    console.log(
      `[faults] PostgreSQL down ${((upAt - downAt) / 1000).toFixed(1)} s; the app answered ${(answerMs / 1000).toFixed(2)} s after it was back; ` +
        `${accepted.length} uploads accepted, ${refused.length} refused while it was down (${[...new Set(refused)].join(', ')}); ${pageStatuses.length} page loads`,
    );
    expect(answerMs).toBeLessThan(10_000);

    // Neither process was restarted.
    expect(web.exitCode).toBeNull();
    expect(worker.exitCode).toBeNull();
    expect(web.pid).toBe(webPid);
    expect(worker.pid).toBe(workerPid);
    const health = await fetch(`${BASE_URL}/api/health`);
    expect(health.status).toBe(200);

    // Every accepted upload is fitted: nothing queued for ever, nothing rejected.
    await waitFor(
      async () => (await query(`select 1 from upload_file where upload_id = any($1) and state = 'queued'`, [accepted])).length === 0,
      90_000,
      'every accepted upload to be fitted',
      500,
    );
    const states = await query<{ state: string; n: number }>(`select state, count(*)::int as n from upload_file where upload_id = any($1) group by state`, [accepted]);
    expect(states.filter((s) => s.state !== 'fitted' && s.state !== 'needs_review')).toEqual([]);
    expect(states.reduce((a, s) => a + s.n, 0)).toBe(accepted.length);
  });
});

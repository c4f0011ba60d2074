import type { ChildProcess } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { waitForMail } from '../helpers/mail';
import { BASE_URL, signIn } from '../helpers/http';
import { query, startMailSink, startWeb, startWorker, stop } from './harness';

/**
 * Issue 12: with the mail server down, a message is queued and retried by the worker until
 * the server takes it, and nothing else fails: the request that sent it succeeds and the app
 * keeps answering.
 */
let web: ChildProcess;
let worker: ChildProcess;
let sink: ChildProcess | undefined;

beforeAll(async () => {
  web = await startWeb();
  worker = await startWorker();
});
afterAll(async () => {
  if (sink) await stop(sink);
  if (worker) await stop(worker);
  if (web) await stop(web);
});

describe('the mail sink down', () => {
  it('a password-reset mail is queued, the request succeeds, and the mail arrives once the sink is back', async () => {
    const to = 'designer@demo.sluice.test';
    const res = await fetch(`${BASE_URL}/api/auth/request-password-reset`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: BASE_URL },
      body: JSON.stringify({ email: to, redirectTo: '/set-password' }),
    });
    expect(res.status).toBe(200);
    // Nothing else fails: pages and sign-in work with the mail server down.
    const designer = await signIn(to);
    expect((await designer.fetch('/api/parts?page=1')).status).toBe(200);

    const queued = async () => query<{ state: string; retry_count: number }>(`select state, retry_count from pgboss.job where name = 'send-mail' and data->>'to' = $1`, [to]);
    let jobs: { state: string; retry_count: number }[] = [];
    for (let i = 0; i < 100 && jobs.length === 0; i++) {
      jobs = await queued();
      if (!jobs.length) await new Promise((r) => setTimeout(r, 100));
    }
    expect(jobs).toHaveLength(1);
    // Let the worker try (and fail) at least once before the sink comes back.
    for (let i = 0; i < 200 && (await queued())[0].retry_count < 1; i++) await new Promise((r) => setTimeout(r, 100));
    expect((await queued())[0].retry_count).toBeGreaterThanOrEqual(1);

    sink = await startMailSink();
    const startedAt = Date.now();
    const mail = await waitForMail(to, /Reset your Sluice password/, 90_000);
    console.log(`[faults] the queued mail arrived ${((Date.now() - startedAt) / 1000).toFixed(1)} s after the sink came back`);
    expect(mail.text).toContain('/set-password?token=');
    expect((await queued())[0].state).toBe('completed');
  });
});

/**
 * npm run bench:load — many people using Sluice at once, against a large stock.
 *
 * Makes the database `sluice_bench_load` on the local cluster (dropped and made anew), loads
 * the demo scenario (its accounts, types, bin plans, lots), adds 100 000 in-stock WS-N30 parts
 * with fits (invented parameters as in bench:match: IDSS 1–20 mA, VTO −0.5 to −4 V, LAMBDA
 * 0.002–0.03 /V; 40 lots, spread over the demo's bins and locations), then starts the built
 * app, one fitting worker and a mail sink on ports of its own (loopback only) and lets 20
 * signed-in people work for 60 s, each in a loop of its role's actions with a short pause
 * between actions (uniform 0–2 × --think-ms, default 300 ms; --think-ms 0 for a saturation run):
 *
 *   8 designers  part pages, the parts list (page and API), one part (API), bin stock, match proposals
 *   6 stores     the stock page, bin stock, the parts of one bin, the parts list, part pages
 *   4 inspectors uploads of 5 simulated sweep files (fitted by the worker meanwhile), upload status, parts list
 *   2 admins     the parts list page, bin stock, one part (API)
 *
 * After a 5 s warm-up that is not counted, it prints p50/p95/p99 per page and API call, the
 * errors (any answer ≥ 400 or a failed connection), requests per second and the peak memory
 * (VmHWM) of the server and the worker. Goal: p95 ≤ 150 ms for pages and reads, zero errors.
 *
 * Options: --parts N (100000), --users N (20), --seconds N (60), --think-ms N (300),
 * --port N (4481), --build (build the app into SLUICE_BENCH_BUILD_DIR, default dist-bench-load,
 * even when it exists), --keep (leave the database).
 */
import type { ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import {
  ROOT, databaseUrl, dropDatabase, ensureDatabases, ensurePostgresInstalled, ensureSecrets, portInUse, run, startChild, startCluster, waitForHttp, waitForPort,
} from './setup-lib.mjs';

const arg = (name: string, fallback: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? Number(process.argv[i + 1]) : fallback;
};
const PARTS = arg('parts', 100_000);
const USERS = Math.max(4, arg('users', 20));
const SECONDS = Math.min(arg('seconds', 60), 600);
const THINK_MS = arg('think-ms', 300);
const PORT = arg('port', 4481);
const SMTP_PORT = PORT + 1;
const WARMUP_MS = 5_000;
const KEEP = process.argv.includes('--keep');
const DB = 'sluice_bench_load';
const BUILD_DIR = process.env.SLUICE_BENCH_BUILD_DIR ?? 'dist-bench-load';
const PASSWORD = 'weir-street-demo';
const TARGET_MS = 150;

const secrets = ensureSecrets() as Record<string, string>;
const bin = ensurePostgresInstalled();
await startCluster(bin);
for (const p of [PORT, SMTP_PORT]) if (await portInUse(p)) throw new Error(`port ${p} is in use; pass --port`);
dropDatabase(bin, DB);
ensureDatabases(bin, secrets.SLUICE_DB_PASSWORD, [DB]);
const runDir = path.join(ROOT, '.data', DB);
const uploadsDir = path.join(runDir, 'uploads');
const mailDir = path.join(runDir, 'mail');
fs.rmSync(runDir, { recursive: true, force: true });

const env: Record<string, string> = {
  NODE_ENV: 'production',
  HOST: '127.0.0.1',
  PORT: String(PORT),
  DATABASE_URL: databaseUrl(secrets.SLUICE_DB_PASSWORD, DB),
  BETTER_AUTH_SECRET: secrets.BETTER_AUTH_SECRET,
  SLUICE_UPLOADS_DIR: uploadsDir,
  SLUICE_BUILD_DIR: BUILD_DIR,
  SMTP_HOST: '127.0.0.1',
  SMTP_PORT: String(SMTP_PORT),
  SLUICE_MAIL_SINK_DIR: mailDir,
  SLUICE_DEMO_PASSWORD: PASSWORD,
  // Twenty people sign in from one loopback address at the start.
  SLUICE_SIGN_IN_LIMIT_PER_MINUTE: '1000',
};
Object.assign(process.env, env);
const tsx = path.join(ROOT, 'node_modules', '.bin', 'tsx');
run(tsx, ['scripts/migrate.ts'], { env: { ...process.env } });
run(tsx, ['scripts/seed-demo.ts'], { env: { ...process.env } });
if (process.argv.includes('--build') || !fs.existsSync(path.join(ROOT, BUILD_DIR, 'server', 'entry.mjs'))) {
  run(path.join(ROOT, 'node_modules', '.bin', 'astro'), ['build'], { env: { ...process.env } });
}

// ---------------------------------------------------------------- 100 000 parts, straight into SQL
const { getPool, closeDb } = await import('~/db/client');
const { randomPartParams, simulateSweepCsv } = await import('~/core/intake/simulated-sweep');
const { seededRandom } = await import('~/core/random/seeded-random');
const pool = getPool();
const q = (text: string, values: unknown[] = []) => pool.query(text, values);
const t0 = performance.now();
const type = (await q(`SELECT id FROM device_type WHERE name = 'WS-N30'`)).rows[0]?.id as number | undefined;
if (!type) throw new Error('the demo scenario has no WS-N30 device type');
const lots = (await q(`INSERT INTO lot (code, device_type_id, supplier) SELECT 'LD-LOT-' || g, $1, 'Bench supplier' FROM generate_series(1, 40) g RETURNING id`, [type])).rows.map(
  (r) => r.id as number,
);
const locations = (await q(`SELECT id FROM location ORDER BY id`)).rows.map((r) => r.id as number);
const bins = (
  await q(`SELECT bin.id FROM bin JOIN bin_plan ON bin_plan.id = bin.bin_plan_id WHERE bin_plan.device_type_id = $1 AND bin_plan.is_active ORDER BY bin.id`, [type])
).rows.map((r) => r.id as number);
if (!bins.length || !locations.length) throw new Error('the demo scenario has no active WS-N30 bins or no locations');

const rand = seededRandom(20261202);
const CHUNK = 10_000;
for (let start = 0; start < PARTS; start += CHUNK) {
  const n = Math.min(CHUNK, PARTS - start);
  const serials: string[] = [], lotIds: number[] = [], binIds: number[] = [], locIds: number[] = [];
  const vto: number[] = [], beta: number[] = [], lambda: number[] = [], idss: number[] = [];
  for (let k = 0; k < n; k++) {
    const i = start + k;
    const idssA = 1e-3 + rand() * 19e-3;
    const vtoV = -0.5 - rand() * 3.5;
    const lam = 0.002 + rand() * 0.028;
    serials.push(`LD-${String(i).padStart(6, '0')}`);
    lotIds.push(lots[i % lots.length]!);
    binIds.push(bins[Math.floor(rand() * bins.length)]!);
    locIds.push(locations[i % locations.length]!);
    vto.push(vtoV);
    beta.push(idssA / (vtoV * vtoV));
    lambda.push(lam);
    idss.push(idssA * (1 + lam * 10));
  }
  await q(
    `WITH p AS (
       INSERT INTO part (serial, device_type_id, lot_id, status, bin_id, location_id)
       SELECT s, $1, l, 'in_stock', b, loc FROM unnest($2::text[], $3::int[], $4::int[], $5::int[]) AS t(s, l, b, loc)
       RETURNING id, serial),
     v AS (SELECT * FROM unnest($2::text[], $6::float8[], $7::float8[], $8::float8[], $9::float8[]) AS t(s, vto, beta, lambda, idss)),
     sw AS (
       INSERT INTO sweep (part_id, vgs_steps_v, curves, point_count, temperature_c)
       SELECT p.id, '{0}', '[]', 0, 25 FROM p RETURNING id, part_id),
     f AS (
       INSERT INTO fit (sweep_id, part_id, model, engine_version, vto_v, beta_a_per_v2, lambda_per_v, idss_a, idss_vds_v, vp_v,
                        gfs_s, gos_s, rds_on_ohm, rms_rel, detail, review)
       SELECT sw.id, p.id, 'level1', 'bench', v.vto, v.beta, v.lambda, v.idss, 10, v.vto, 2 * v.idss / abs(v.vto), 0,
              1 / (2 * v.beta * abs(v.vto)), 0.01, '{}', 'auto_accepted'
       FROM p JOIN sw ON sw.part_id = p.id JOIN v ON v.s = p.serial
       RETURNING id)
     SELECT count(*) FROM f`,
    [type, serials, lotIds, binIds, locIds, vto, beta, lambda, idss],
  );
}
await q('UPDATE part SET current_fit_id = fit.id FROM fit WHERE fit.part_id = part.id AND part.current_fit_id IS NULL');
for (const table of ['part', 'fit', 'sweep', 'lot']) await q(`VACUUM ANALYZE ${table}`);
const demoSerials = (await q(`SELECT serial FROM part WHERE serial NOT LIKE 'LD-%' AND current_fit_id IS NOT NULL ORDER BY serial`)).rows.map((r) => r.serial as string);
const totalParts = Number((await q('SELECT count(*) FROM part')).rows[0].count);
console.log(`[bench] ${totalParts} parts in the database (${PARTS} added in ${((performance.now() - t0) / 1000).toFixed(1)} s)`);
await closeDb();

// ---------------------------------------------------------------- the app
const logs = path.join(runDir, 'logs');
const children: ChildProcess[] = [];
const stopAll = () => {
  for (const c of children) c.kill('SIGTERM');
};
process.on('exit', stopAll);
children.push(startChild('mail', tsx, ['scripts/mail-sink.ts'], env, path.join(logs, 'mail.log')));
await waitForPort(SMTP_PORT);
const worker = startChild('worker', tsx, ['src/worker.ts'], env, path.join(logs, 'worker.log'));
children.push(worker);
const web = startChild('web', process.execPath, [path.join(ROOT, BUILD_DIR, 'server', 'entry.mjs')], env, path.join(logs, 'web.log'));
children.push(web);
const BASE = `http://127.0.0.1:${PORT}`;
await waitForHttp(`${BASE}/api/health`, 120_000);

/** Peak resident memory (VmHWM, kB) of a process and all its descendants (tsx runs node as a child). */
function peakKb(pid: number): number {
  let kb = 0;
  try {
    kb = Number(/VmHWM:\s+(\d+)/.exec(fs.readFileSync(`/proc/${pid}/status`, 'utf8'))?.[1] ?? 0);
    for (const task of fs.readdirSync(`/proc/${pid}/task`)) {
      const kids = fs.readFileSync(`/proc/${pid}/task/${task}/children`, 'utf8').trim();
      for (const k of kids ? kids.split(/\s+/) : []) kb = Math.max(kb, peakKb(Number(k)));
    }
  } catch {
    /* process gone */
  }
  return kb;
}

/** CPU seconds (user + system) of a process and its descendants, from /proc. */
function cpuSeconds(pid: number): number {
  let ticks = 0;
  try {
    const stat = fs.readFileSync(`/proc/${pid}/stat`, 'utf8');
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    ticks = Number(fields[11]) + Number(fields[12]);
    for (const task of fs.readdirSync(`/proc/${pid}/task`)) {
      const kids = fs.readFileSync(`/proc/${pid}/task/${task}/children`, 'utf8').trim();
      for (const k of kids ? kids.split(/\s+/) : []) ticks += cpuSeconds(Number(k)) * 100;
    }
  } catch {
    /* process gone */
  }
  return ticks / 100;
}

// ---------------------------------------------------------------- the people
type Role = 'designer' | 'stores' | 'inspector' | 'admin';
interface Person {
  role: Role;
  cookie: string;
  n: number;
}

async function signIn(role: Role, n: number): Promise<Person> {
  const res = await fetch(`${BASE}/api/auth/sign-in/email`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: BASE },
    body: JSON.stringify({ email: `${role}@demo.sluice.test`, password: PASSWORD }),
  });
  if (!res.ok) throw new Error(`sign-in of ${role} failed: ${res.status} ${await res.text()}`);
  return { role, n, cookie: res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ') };
}

const mix: Role[] = [];
const share = { designer: 8, stores: 6, inspector: 4, admin: 2 };
for (const [role, count] of Object.entries(share) as [Role, number][]) for (let i = 0; i < Math.round((count * USERS) / 20); i++) mix.push(role);
const people = await Promise.all(mix.map((role, i) => signIn(role, i)));

interface Sample {
  name: string;
  ms: number;
  ok: boolean;
  status: number;
  at: number;
}
const samples: Sample[] = [];
const errorExamples = new Map<string, string>();
let measuring = false;

const pick = <T>(xs: readonly T[], r: () => number): T => xs[Math.floor(r() * xs.length)]!;
const partSerial = (r: () => number) => (r() < 0.8 ? `LD-${String(Math.floor(r() * PARTS)).padStart(6, '0')}` : pick(demoSerials, r));

async function timed(p: Person, name: string, pathname: string, init: RequestInit = {}, expect = [200]): Promise<Response | null> {
  const t = performance.now();
  let status = 0;
  let body = '';
  let res: Response | null = null;
  try {
    res = await fetch(`${BASE}${pathname}`, { ...init, redirect: 'manual', headers: { cookie: p.cookie, origin: BASE, ...(init.headers ?? {}) } });
    status = res.status;
    body = await res.text();
  } catch (err) {
    body = String(err);
  }
  const ms = performance.now() - t;
  const ok = expect.includes(status);
  if (measuring) samples.push({ name, ms, ok, status, at: performance.now() });
  if (!ok && !errorExamples.has(name)) errorExamples.set(name, `${status} ${pathname}: ${body.slice(0, 300)}`);
  return ok && res ? new Response(body, { status, headers: res.headers }) : null;
}

const getJson = (p: Person, name: string, pathname: string) => timed(p, name, pathname, { headers: { accept: 'application/json' } });

let uploadSeq = 0;
const binIdsForApi: number[] = [];
async function act(p: Person, r: () => number): Promise<void> {
  const x = r();
  switch (p.role) {
    case 'designer':
      if (x < 0.2) await timed(p, 'page /parts/[serial]', `/parts/${encodeURIComponent(partSerial(r))}`);
      else if (x < 0.35) await timed(p, 'page /parts', `/parts?page=${1 + Math.floor(r() * 50)}`);
      else if (x < 0.55) await getJson(p, 'GET /api/parts', `/api/parts?device_type=WS-N30&page=${1 + Math.floor(r() * 200)}`);
      else if (x < 0.7) await getJson(p, 'GET /api/parts/[serial]', `/api/parts/${encodeURIComponent(partSerial(r))}`);
      else if (x < 0.85) await getJson(p, 'GET /api/bins', '/api/bins?device_type=WS-N30');
      else
        await timed(
          p,
          'POST /api/match/proposals',
          '/api/match/proposals',
          {
            method: 'POST',
            headers: { 'content-type': 'application/json' },
            body: JSON.stringify({ device_type: 'WS-N30', shape: 'pair', count: 5, id_a: 1e-3 * (0.8 + 0.4 * r()), vds_v: 10, max_dvgs_v: 0.01 }),
          },
          [201],
        );
      return;
    case 'stores':
      if (x < 0.2) await timed(p, 'page /stock', '/stock');
      else if (x < 0.45) await getJson(p, 'GET /api/bins', '/api/bins?device_type=WS-N30');
      else if (x < 0.7 && binIdsForApi.length) await getJson(p, 'GET /api/bins/[id]/parts', `/api/bins/${pick(binIdsForApi, r)}/parts?page=${1 + Math.floor(r() * 20)}`);
      else if (x < 0.85) await getJson(p, 'GET /api/parts', `/api/parts?page=${1 + Math.floor(r() * 200)}`);
      else await timed(p, 'page /parts/[serial]', `/parts/${encodeURIComponent(partSerial(r))}`);
      return;
    case 'inspector':
      if (x < 0.4) {
        const form = new FormData();
        form.set('device_type', 'WS-N30');
        for (let k = 0; k < 5; k++) {
          const serial = `LDU-${p.n}-${++uploadSeq}-${k}`;
          const text = simulateSweepCsv({ serial, channel: 'n', params: randomPartParams(r), deviceType: 'WS-N30', temperatureC: 25, rand: r });
          form.append('file', new Blob([text], { type: 'text/csv' }), `${serial}.csv`);
        }
        const res = await timed(p, 'POST /api/sweeps (5 files)', '/api/sweeps', { method: 'POST', body: form }, [202]);
        const id = res ? ((await res.json()) as { upload_id?: string; id?: string }) : null;
        const uploadId = id?.upload_id ?? id?.id;
        if (uploadId) await getJson(p, 'GET /api/uploads/[id]', `/api/uploads/${uploadId}`);
      } else if (x < 0.7) await getJson(p, 'GET /api/parts', `/api/parts?page=${1 + Math.floor(r() * 200)}&device_type=WS-N30`);
      else await timed(p, 'page /parts', `/parts?page=${1 + Math.floor(r() * 50)}`);
      return;
    case 'admin':
      if (x < 0.4) await timed(p, 'page /parts', `/parts?page=${1 + Math.floor(r() * 50)}`);
      else if (x < 0.7) await getJson(p, 'GET /api/bins', '/api/bins?device_type=WS-N30');
      else await getJson(p, 'GET /api/parts/[serial]', `/api/parts/${encodeURIComponent(partSerial(r))}`);
      return;
  }
}

{
  const stores = people.find((p) => p.role === 'stores')!;
  const res = await fetch(`${BASE}/api/bins?device_type=WS-N30`, { headers: { cookie: stores.cookie } });
  const body = (await res.json()) as { bins?: { id: number }[] };
  for (const b of body.bins ?? []) binIdsForApi.push(b.id);
}

console.log(
  `[bench] ${people.length} people (${Object.entries(share).map(([r, c]) => `${Math.round((c * USERS) / 20)} ${r}`).join(', ')}), ` +
    `pause 0–${2 * THINK_MS} ms between actions; ${WARMUP_MS / 1000} s warm-up, then ${SECONDS} s counted`,
);
const start = performance.now();
const end = start + WARMUP_MS + SECONDS * 1000;
let webCpu0 = 0;
let workerCpu0 = 0;
setTimeout(() => {
  measuring = true;
  webCpu0 = cpuSeconds(web.pid!);
  workerCpu0 = cpuSeconds(worker.pid!);
}, WARMUP_MS);
await Promise.all(
  people.map(async (p, i) => {
    const r = seededRandom(1000 + i);
    while (performance.now() < end) {
      await act(p, r);
      if (THINK_MS > 0) await new Promise((res) => setTimeout(res, r() * 2 * THINK_MS));
    }
  }),
);
const webCpu = cpuSeconds(web.pid!) - webCpu0;
const workerCpu = cpuSeconds(worker.pid!) - workerCpu0;
const webPeakMb = peakKb(web.pid!) / 1024;
const workerPeakMb = peakKb(worker.pid!) / 1024;
stopAll();

// ---------------------------------------------------------------- the figures
const pct = (xs: number[], p: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? s[Math.min(s.length - 1, Math.ceil(p * s.length) - 1)]! : Number.NaN;
};
const names = [...new Set(samples.map((s) => s.name))].sort();
const rows = names.map((name) => {
  const xs = samples.filter((s) => s.name === name);
  const ms = xs.map((s) => s.ms);
  return { name, n: xs.length, errors: xs.filter((s) => !s.ok).length, p50: pct(ms, 0.5), p95: pct(ms, 0.95), p99: pct(ms, 0.99), isRead: !name.startsWith('POST') };
});
const width = Math.max(...rows.map((r) => r.name.length), 10);
console.log(`\n${'page or call'.padEnd(width)}  ${'count'.padStart(6)}  ${'p50 ms'.padStart(7)}  ${'p95 ms'.padStart(7)}  ${'p99 ms'.padStart(7)}  errors`);
for (const r of rows) {
  console.log(`${r.name.padEnd(width)}  ${String(r.n).padStart(6)}  ${r.p50.toFixed(1).padStart(7)}  ${r.p95.toFixed(1).padStart(7)}  ${r.p99.toFixed(1).padStart(7)}  ${r.errors}`);
}
const reads = samples.filter((s) => !s.name.startsWith('POST'));
const errors = samples.filter((s) => !s.ok).length;
const worstReadP95 = Math.max(...rows.filter((r) => r.isRead).map((r) => r.p95));
console.log(`\n${samples.length} requests in ${SECONDS} s (${(samples.length / SECONDS).toFixed(1)} per second); pages and reads together: p50 ${pct(reads.map((s) => s.ms), 0.5).toFixed(1)} ms, p95 ${pct(reads.map((s) => s.ms), 0.95).toFixed(1)} ms, p99 ${pct(reads.map((s) => s.ms), 0.99).toFixed(1)} ms`);
console.log(`errors: ${errors}${errors ? ` (${[...errorExamples.entries()].map(([n, e]) => `${n}: ${e}`).join(' | ')})` : ''}`);
console.log(`peak memory (VmHWM): server ${webPeakMb.toFixed(0)} MB, worker ${workerPeakMb.toFixed(0)} MB`);
console.log(`CPU in the counted ${SECONDS} s: server ${webCpu.toFixed(1)} s (${((webCpu * 1000) / Math.max(1, samples.length)).toFixed(1)} ms a request), worker ${workerCpu.toFixed(1)} s`);
console.log(`machine: ${os.cpus().length} cores (${os.cpus()[0]?.model ?? 'unknown'}), load average at the end ${os.loadavg().map((l) => l.toFixed(2)).join(' ')} — shared machines give other figures`);
const within = worstReadP95 <= TARGET_MS && errors === 0;
console.log(within ? `within the goal: every page and read p95 ≤ ${TARGET_MS} ms, no errors` : `NOT within the goal (p95 ≤ ${TARGET_MS} ms for every page and read, no errors): worst read p95 ${worstReadP95.toFixed(1)} ms, ${errors} errors`);

if (!KEEP) {
  await new Promise((r) => setTimeout(r, 1000));
  dropDatabase(bin, DB);
}
process.exit(0);

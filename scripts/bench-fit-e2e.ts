/**
 * End-to-end intake speed: `npx tsx scripts/bench-fit-e2e.ts [--files 10000] [--workers 2]
 * [--per-request 50] [--parallel 4] [--build] [--profile DIR]`. Starts its own server and fitting workers on
 * a bench database (loopback only), uploads N distinct simulated sweep files through
 * POST /api/sweeps with a station token, waits until every file has a stored fit (or a
 * reason), and prints sweeps per second, total seconds and peak memory (VmHWM of each
 * process). Bounded: at most 20 000 files and 10 minutes.
 */
import type { ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import {
  ROOT, databaseUrl, dropDatabase, ensureDatabases, ensurePostgresInstalled, ensureSecrets, portInUse, run, startChild, startCluster, waitForHttp,
} from './setup-lib.mjs';

function arg(name: string, fallback: number): number {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? Number(process.argv[i + 1]) : fallback;
}
const FILES = Math.min(arg('files', 10_000), 20_000);
const WORKERS = Math.min(arg('workers', 2), 8);
const PER_REQUEST = Math.min(arg('per-request', 50), 500);
const PARALLEL = Math.min(arg('parallel', 4), 16);
const PORT = arg('port', 4471);
const DB = 'sluice_bench';
const BUILD_DIR = process.env.SLUICE_BENCH_BUILD_DIR ?? 'dist-bench';
const TIME_LIMIT_MS = 10 * 60_000;

const secrets = ensureSecrets() as Record<string, string>;
const bin = ensurePostgresInstalled();
await startCluster(bin);
dropDatabase(bin, DB);
ensureDatabases(bin, secrets.SLUICE_DB_PASSWORD, [DB]);
const runDir = path.join(ROOT, '.data', DB);
const uploadsDir = path.join(runDir, 'uploads');
fs.rmSync(uploadsDir, { recursive: true, force: true });
if (await portInUse(PORT)) throw new Error(`port ${PORT} is in use; pass --port`);

const env: Record<string, string> = {
  NODE_ENV: 'production',
  HOST: '127.0.0.1',
  PORT: String(PORT),
  DATABASE_URL: databaseUrl(secrets.SLUICE_DB_PASSWORD, DB),
  BETTER_AUTH_SECRET: secrets.BETTER_AUTH_SECRET,
  SLUICE_UPLOADS_DIR: uploadsDir,
  SLUICE_BUILD_DIR: BUILD_DIR,
  SMTP_PORT: '1', // no mail is sent in this run
  SLUICE_DEMO_PASSWORD: 'weir-street-demo',
};
Object.assign(process.env, env);
const tsx = path.join(ROOT, 'node_modules', '.bin', 'tsx');
run(tsx, ['scripts/migrate.ts'], { env: { ...process.env } });
run(tsx, ['scripts/seed-demo.ts'], { env: { ...process.env } });
if (process.argv.includes('--build') || !fs.existsSync(path.join(ROOT, BUILD_DIR, 'server', 'entry.mjs'))) {
  run(path.join(ROOT, 'node_modules', '.bin', 'astro'), ['build'], { env: { ...process.env } });
}

const { getDb, closeDb, getPool } = await import('~/db/client');
const { createStationToken } = await import('~/lib/server/services/stations/create');
const { FIT_BATCH_SIZE } = await import('~/lib/server/jobs/fit-upload-file');
const { randomPartParams, simulateSweepCsv } = await import('~/core/intake/simulated-sweep');
const { seededRandom } = await import('~/core/random/seeded-random');
void getDb;
const station = await createStationToken({ actor: { userId: null, stationId: null, label: 'bench', permissions: ['stations:manage'] }, input: { name: 'bench station' } });

const logs = path.join(runDir, 'logs');
const children: ChildProcess[] = [];
// One at a time: pg-boss's queue creation can deadlock when several processes start at once.
// --profile DIR writes a V8 CPU profile of the server and each worker there (node --cpu-prof, on exit).
const profileAt = process.argv.indexOf('--profile');
const profileDir = profileAt > 0 ? path.resolve(process.argv[profileAt + 1]) : null;
// The server exits on SIGTERM with process.exit so that its profile is written.
const exitOnTerm = ['--import', "data:text/javascript,process.on('SIGTERM',()=>process.exit(0))"];
const serverEntry = path.join(ROOT, BUILD_DIR, 'server', 'entry.mjs');
children.push(
  startChild('web', process.execPath, profileDir ? ['--cpu-prof', `--cpu-prof-dir=${profileDir}`, ...exitOnTerm, serverEntry] : [serverEntry], env, path.join(logs, 'web.log')),
);
for (let i = 0; i < WORKERS; i++) {
  const log = path.join(logs, `worker${i}.log`);
  const worker = profileDir
    ? startChild(`worker${i}`, process.execPath, ['--cpu-prof', `--cpu-prof-dir=${profileDir}`, '--import', 'tsx', 'src/worker.ts'], env, log)
    : startChild(`worker${i}`, tsx, ['src/worker.ts'], env, log);
  children.push(worker);
  const ready = () => fs.existsSync(log) && fs.readFileSync(log, 'utf8').includes('worker ready');
  for (let k = 0; k < 150 && !ready() && worker.exitCode === null; k++) await new Promise((r) => setTimeout(r, 200));
  if (!ready()) {
    for (const c of children) c.kill('SIGTERM');
    throw new Error(`worker ${i} did not start; its log (${log}) says:\n${fs.existsSync(log) ? fs.readFileSync(log, 'utf8').slice(-2000) : '(nothing)'}`);
  }
}
const baseUrl = `http://127.0.0.1:${PORT}`;
await waitForHttp(`${baseUrl}/api/health`, 120_000);

console.log(`[bench] generating ${FILES} distinct sweep files (9 gate steps × 41 points, 0.3 % noise)`);
const rand = seededRandom(424242);
const files = Array.from({ length: FILES }, (_, i) => ({
  name: `BENCH-${String(i).padStart(5, '0')}.csv`,
  text: simulateSweepCsv({ serial: `BENCH-${String(i).padStart(5, '0')}`, channel: 'n', params: randomPartParams(rand), deviceType: 'WS-N30', temperatureC: 25, rand }),
}));
const bytes = files.reduce((s, f) => s + f.text.length, 0);

/** Peak resident memory (VmHWM, kB) of a process and all its descendants (tsx runs node as a child). */
function peakKb(pid: number): number {
  let kb = 0;
  try {
    const status = fs.readFileSync(`/proc/${pid}/status`, 'utf8');
    kb = Number(/VmHWM:\s+(\d+)/.exec(status)?.[1] ?? 0);
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

/** CPU seconds of every PostgreSQL process now running (the cluster's own and its backends). */
function postgresCpuSeconds(): number {
  let total = 0;
  for (const entry of fs.readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      if (fs.readFileSync(`/proc/${entry}/comm`, 'utf8').trim() !== 'postgres') continue;
      const stat = fs.readFileSync(`/proc/${entry}/stat`, 'utf8');
      const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
      total += Number(fields[11]) + Number(fields[12]);
    } catch {
      /* process gone */
    }
  }
  return total / 100;
}

const pool = getPool();
const cpuBefore = { children: children.map((c) => cpuSeconds(c.pid!)), postgres: postgresCpuSeconds(), client: process.cpuUsage() };
const started = performance.now();
let posted = 0;
let uploadMs = 0;
const batches: (typeof files)[] = [];
for (let i = 0; i < files.length; i += PER_REQUEST) batches.push(files.slice(i, i + PER_REQUEST));
let next = 0;
async function poster() {
  while (next < batches.length) {
    const batch = batches[next++];
    const form = new FormData();
    for (const f of batch) form.append('file', new Blob([f.text], { type: 'text/csv' }), f.name);
    let res: Response;
    try {
      res = await fetch(`${baseUrl}/api/sweeps`, { method: 'POST', body: form, headers: { authorization: `Bearer ${station.token}`, origin: baseUrl } });
    } catch (err) {
      throw new Error(`POST /api/sweeps failed: ${(err as Error).message} (${String((err as { cause?: unknown }).cause)})`);
    }
    if (res.status !== 202) throw new Error(`POST /api/sweeps answered ${res.status}: ${await res.text()}`);
    await res.arrayBuffer();
    posted += batch.length;
  }
}
const posting = Promise.all(Array.from({ length: PARALLEL }, poster)).then(() => {
  uploadMs = performance.now() - started;
});

let done = 0;
let last = 0;
while (performance.now() - started < TIME_LIMIT_MS) {
  await new Promise((r) => setTimeout(r, 250));
  const { rows } = await pool.query(`select count(*)::int as n from upload_file where state <> 'queued' and original_name like 'BENCH-%'`);
  done = rows[0].n;
  if (performance.now() - last > 5000) {
    last = performance.now();
    console.log(`[bench] ${((performance.now() - started) / 1000).toFixed(1)} s: ${posted} posted, ${done} finished`);
  }
  if (done >= FILES && posted >= FILES) break;
}
await posting;
const totalS = (performance.now() - started) / 1000;

const states = await pool.query(`select state, count(*)::int as n from upload_file where original_name like 'BENCH-%' group by state order by state`);
const fits = await pool.query(`select count(*)::int as n, count(*) filter (where model = 'level1+rs_rd')::int as extended from fit f join part p on p.id = f.part_id where p.serial like 'BENCH-%'`);
const peaks = children.map((c, i) => ({ name: i === 0 ? 'server' : `worker ${i}`, mb: peakKb(c.pid!) / 1024 }));
const cpu = children.map((c, i) => ({ name: i === 0 ? 'server' : `worker ${i}`, s: cpuSeconds(c.pid!) - cpuBefore.children[i] }));
const postgresCpu = postgresCpuSeconds() - cpuBefore.postgres;
const clientCpu = process.cpuUsage(cpuBefore.client);

console.log('\n[bench] end-to-end intake');
console.log(`  files               ${FILES} (${(bytes / 1e6).toFixed(1)} MB), ${PER_REQUEST} per request, ${PARALLEL} requests in flight`);
console.log(`  fitting workers     ${WORKERS} processes × ${process.env.SLUICE_FIT_LOOPS ?? 2} loops, batches of ${FIT_BATCH_SIZE} jobs`);
console.log(`  all POSTs answered  ${(uploadMs / 1000).toFixed(1)} s`);
console.log(`  all files finished  ${totalS.toFixed(1)} s  →  ${(FILES / totalS).toFixed(0)} sweeps per second`);
console.log(`  stored fits         ${fits.rows[0].n} (${fits.rows[0].extended} kept RS/RD)`);
console.log(`  file states         ${states.rows.map((r) => `${r.state} ${r.n}`).join(', ')}`);
console.log(`  peak memory (VmHWM) ${peaks.map((p) => `${p.name} ${p.mb.toFixed(0)} MB`).join(', ')}`);
console.log(`  CPU during the run  ${cpu.map((c) => `${c.name} ${c.s.toFixed(1)} s`).join(', ')}, PostgreSQL ${postgresCpu.toFixed(1)} s (processes still running), this uploading client ${((clientCpu.user + clientCpu.system) / 1e6).toFixed(1)} s`);
console.log(`  target              ≤ 60 s for 10 000 files: ${FILES === 10_000 ? (totalS <= 60 ? 'met' : 'NOT met') : 'n/a (other file count)'}`);

for (const c of children) c.kill('SIGTERM');
await closeDb();
setTimeout(() => process.exit(0), 500);

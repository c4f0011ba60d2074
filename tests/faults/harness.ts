/**
 * Processes for the fault drills: the built web server, workers, the mail sink and the
 * drills' own PostgreSQL (scripts/test-faults.mjs made it; never the project's shared
 * cluster). Every child is killed when the test process exits.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import pg from 'pg';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const need = (name: string): string => {
  const v = process.env[name];
  if (!v) throw new Error(`${name} is not set: run the fault drills with npm run test:faults`);
  return v;
};
export const BASE_URL = need('SLUICE_TEST_BASE_URL');
const LOGS = need('SLUICE_FAULTS_LOGS');

const live = new Set<ChildProcess>();
process.on('exit', () => {
  for (const c of live) c.kill('SIGKILL');
});

let counter = 0;
/** Log files carry the id of the test process (one per test file) that started them. */
const logPrefix = `test-${process.pid}`;
function startProcess(name: string, args: string[], extraEnv: Record<string, string> = {}): ChildProcess {
  const log = fs.createWriteStream(path.join(LOGS, `${logPrefix}-${name}-${++counter}.log`));
  const child = spawn(process.execPath, args, { cwd: ROOT, env: { ...process.env, ...extraEnv }, stdio: ['ignore', 'pipe', 'pipe'] });
  child.stdout!.pipe(log, { end: false });
  child.stderr!.pipe(log, { end: false });
  child.on('close', () => log.end());
  live.add(child);
  child.on('exit', () => live.delete(child));
  return child;
}

/**
 * The worker itself (node with tsx's loader, no wrapper process, so that kill -9 hits it),
 * once it says it is ready.
 */
export async function startWorker(extraEnv: Record<string, string> = {}): Promise<ChildProcess> {
  const child = startProcess('worker', ['--import', 'tsx', 'src/worker.ts'], extraEnv);
  let ready = false;
  child.stdout!.on('data', (b: Buffer) => {
    if (b.toString().includes('worker ready')) ready = true;
  });
  await waitFor(() => ready || child.exitCode !== null, 90_000, 'the worker to be ready', 100);
  if (!ready) throw new Error(`the worker exited (${child.exitCode}) before it was ready`);
  return child;
}

export async function startWeb(): Promise<ChildProcess> {
  const child = startProcess('web', [path.join(ROOT, need('SLUICE_BUILD_DIR'), 'server', 'entry.mjs')]);
  await waitFor(async () => (await fetch(`${BASE_URL}/api/health`).catch(() => null))?.ok === true, 60_000, 'the web server to answer');
  return child;
}

export async function startMailSink(): Promise<ChildProcess> {
  const child = startProcess('mail', ['--import', 'tsx', 'scripts/mail-sink.ts']);
  await waitFor(() => portOpen(Number(need('SMTP_PORT'))), 20_000, 'the mail sink to listen');
  return child;
}

/** Ends a child and waits for it: SIGTERM by default, SIGKILL for a crash. */
export function stop(child: ChildProcess, signal: NodeJS.Signals = 'SIGTERM'): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve();
  return new Promise((resolve) => {
    child.once('exit', () => resolve());
    child.kill(signal);
  });
}

export function portOpen(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = net.connect({ host: '127.0.0.1', port });
    s.once('connect', () => {
      s.destroy();
      resolve(true);
    });
    s.once('error', () => resolve(false));
  });
}

export async function waitFor(check: () => boolean | Promise<boolean>, timeoutMs: number, what: string, everyMs = 200): Promise<number> {
  const start = Date.now();
  while (Date.now() - start < timeoutMs) {
    if (await check()) return Date.now() - start;
    await new Promise((r) => setTimeout(r, everyMs));
  }
  throw new Error(`timed out after ${timeoutMs / 1000} s waiting for ${what}`);
}

function pgCtl(args: string[]) {
  const bin = path.join(need('SLUICE_FAULTS_PG_BIN'), 'pg_ctl');
  const asRoot = process.getuid?.() === 0;
  const r = asRoot ? spawnSync('runuser', ['-u', 'postgres', '--', bin, ...args], { encoding: 'utf8' }) : spawnSync(bin, args, { encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`pg_ctl ${args.join(' ')} failed: ${r.stdout}${r.stderr}`);
}

/** Stops the drills' PostgreSQL as a crash would (immediate mode: connections cut, no checkpoint). */
export function stopPostgres(): void {
  pgCtl(['-D', need('SLUICE_FAULTS_PG_DATA'), '-m', 'immediate', '-w', 'stop']);
}

export function startPostgres(): void {
  pgCtl(['-D', need('SLUICE_FAULTS_PG_DATA'), '-l', need('SLUICE_FAULTS_PG_LOG'), '-o', need('SLUICE_FAULTS_PG_OPTIONS'), '-w', '-t', '60', 'start']);
}

/** A superuser connection to a database of the drills' cluster (through its socket). */
export function adminClient(database = 'postgres'): pg.Client {
  return new pg.Client({ host: need('SLUICE_FAULTS_PG_DATA'), port: Number(need('SLUICE_FAULTS_PG_PORT')), user: 'postgres', database });
}

/** The app's own database, as the app connects to it. */
export function appClient(): pg.Client {
  return new pg.Client({ connectionString: need('DATABASE_URL') });
}

export async function query<T = Record<string, unknown>>(sql: string, params: unknown[] = []): Promise<T[]> {
  const c = appClient();
  await c.connect();
  try {
    return (await c.query(sql, params)).rows as T[];
  } finally {
    await c.end();
  }
}

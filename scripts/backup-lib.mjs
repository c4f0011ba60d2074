// Shared parts of `npm run backup` and `npm run restore`: which database and uploads folder
// are meant, the manifest, and the checks both sides make.
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import {
  ROOT, databaseUrl, ensureDatabases, ensurePostgresInstalled, ensureSecrets, fail, pgBinDir, startCluster,
} from './setup-lib.mjs';

export const MANIFEST = 'manifest.json';
export const DUMP = 'database.dump';
export const FORMAT = 'sluice-backup';
export const FORMAT_VERSION = 1;

/**
 * The installation meant: DATABASE_URL when set (another PostgreSQL), else the project's
 * cluster (started when it is not running) and its `sluice` database; uploads in
 * SLUICE_UPLOADS_DIR (relative to the project folder) or `uploads/`.
 */
export async function installation() {
  const uploadsDir = path.resolve(ROOT, process.env.SLUICE_UPLOADS_DIR ?? 'uploads');
  if (process.env.DATABASE_URL) return { url: process.env.DATABASE_URL, uploadsDir, bin: pgBinDir() ?? '/usr/bin' };
  const secrets = ensureSecrets();
  const bin = ensurePostgresInstalled();
  await startCluster(bin);
  ensureDatabases(bin, secrets.SLUICE_DB_PASSWORD, ['sluice', 'sluice_test']);
  return { url: databaseUrl(secrets.SLUICE_DB_PASSWORD, 'sluice'), uploadsDir, bin };
}

export const databaseName = (url) => decodeURIComponent(new URL(url).pathname.slice(1));

/** Runs a PostgreSQL client program; exits with its error output when it fails. */
export function runPgTool(bin, tool, args) {
  const r = spawnSync(path.join(bin, tool), args, { encoding: 'utf8', cwd: ROOT, maxBuffer: 64 * 1024 * 1024 });
  if (r.status !== 0) fail(`${tool} failed (exit ${r.status ?? r.signal}):\n${r.stderr || r.stdout}`);
  return r.stdout;
}

export function sha256File(file) {
  const hash = createHash('sha256');
  const fd = fs.openSync(file, 'r');
  try {
    const buf = Buffer.allocUnsafe(1 << 20);
    for (let n; (n = fs.readSync(fd, buf, 0, buf.length, null)) > 0; ) hash.update(buf.subarray(0, n));
  } finally {
    fs.closeSync(fd);
  }
  return hash.digest('hex');
}

/** Every stored upload under `dir` (relative POSIX paths), leaving out half-written `.part` files. */
export function listUploads(dir) {
  const out = [];
  if (!fs.existsSync(dir)) return out;
  const walk = (rel) => {
    for (const e of fs.readdirSync(path.join(dir, rel), { withFileTypes: true })) {
      const p = rel ? `${rel}/${e.name}` : e.name;
      if (e.isDirectory()) walk(p);
      else if (e.isFile() && !e.name.endsWith('.part') && e.name !== '.gitkeep') out.push(p);
    }
  };
  walk('');
  return out.sort();
}

/**
 * Exact row counts of every table (partitions included) in the database, read inside `client`'s
 * current transaction, as `schema.table` → count.
 */
export async function countRows(client) {
  const { rows } = await client.query(`
    select n.nspname as schema, c.relname as name
    from pg_class c join pg_namespace n on n.oid = c.relnamespace
    where c.relkind in ('r', 'p') and n.nspname not in ('pg_catalog', 'information_schema') and n.nspname not like 'pg_toast%'
    order by 1, 2`);
  const counts = {};
  for (const { schema, name } of rows) {
    const ident = `"${schema.replace(/"/g, '""')}"."${name.replace(/"/g, '""')}"`;
    const r = await client.query(`select count(*)::bigint as n from only ${ident}`);
    counts[`${schema}.${name}`] = Number(r.rows[0].n);
  }
  return counts;
}

import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { adminClient } from './harness';

/**
 * Issue 12, finding 10: `npm run backup` then `npm run restore` bring back the demo
 * installation whole. The drill seeds the demo into a database of its own, backs it up,
 * wipes the database and the uploads, restores, and compares every table's row count and
 * every upload's SHA-256 with what it counted before (its own counts, not the manifest's).
 */
const DB = 'sluice_backup_drill';
const runDir = process.env.SLUICE_FAULTS_RUN_DIR!;
const uploadsDir = path.join(runDir, 'backup-drill-uploads');
const archive = path.join(runDir, 'backup-drill.tar.gz');
const url = new URL(process.env.DATABASE_URL!);
url.pathname = `/${DB}`;
const env = { ...process.env, DATABASE_URL: url.toString(), SLUICE_UPLOADS_DIR: uploadsDir };
const tsx = path.resolve('node_modules/.bin/tsx');

async function admin<T>(database: string, work: (c: ReturnType<typeof adminClient>) => Promise<T>): Promise<T> {
  const c = adminClient(database);
  await c.connect();
  try {
    return await work(c);
  } finally {
    await c.end();
  }
}

/** Every table of every schema with its exact row count. */
async function tableCounts(): Promise<Record<string, number>> {
  return admin(DB, async (c) => {
    const tables = await c.query<{ t: string }>(
      `select format('%I.%I', table_schema, table_name) as t from information_schema.tables
       where table_type = 'BASE TABLE' and table_schema not in ('pg_catalog', 'information_schema') order by 1`,
    );
    const out: Record<string, number> = {};
    for (const { t } of tables.rows) out[t] = Number((await c.query(`select count(*) as n from ${t}`)).rows[0].n);
    return out;
  });
}

function uploadHashes(): Record<string, string> {
  const out: Record<string, string> = {};
  for (const rel of fs.readdirSync(uploadsDir, { recursive: true }) as string[]) {
    const abs = path.join(uploadsDir, rel);
    if (fs.statSync(abs).isFile()) out[rel] = createHash('sha256').update(fs.readFileSync(abs)).digest('hex');
  }
  return out;
}

function node(script: string, args: string[]) {
  const r = spawnSync(process.execPath, [script, ...args], { env, encoding: 'utf8', timeout: 120_000 });
  return { status: r.status, output: `${r.stdout}${r.stderr}` };
}

afterAll(async () => {
  await admin('postgres', (c) => c.query(`drop database if exists ${DB} with (force)`));
});

describe('backup and restore', () => {
  it('restores the demo into an emptied installation: every row count and every upload hash as before', async () => {
    await admin('postgres', async (c) => {
      await c.query(`drop database if exists ${DB} with (force)`);
      await c.query(`create database ${DB} owner sluice`);
    });
    for (const script of ['scripts/migrate.ts', 'scripts/seed-demo.ts']) {
      const r = spawnSync(tsx, [script], { env, encoding: 'utf8', timeout: 180_000 });
      expect(r.status, `${script}: ${r.stderr}`).toBe(0);
    }
    const countsBefore = await tableCounts();
    const hashesBefore = uploadHashes();
    expect(Object.keys(hashesBefore).length).toBeGreaterThan(10);
    expect(countsBefore['public.part']).toBeGreaterThan(0);
    expect(countsBefore['public.sweep']).toBeGreaterThan(0);

    const backup = node('scripts/backup.mjs', ['--out', archive]);
    expect(backup.status, backup.output).toBe(0);
    const manifest = JSON.parse(spawnSync('tar', ['-xzOf', archive, 'manifest.json'], { encoding: 'utf8' }).stdout);
    expect(manifest.files.length).toBe(Object.keys(hashesBefore).length);

    // Into a non-empty installation it refuses, and changes nothing.
    const refused = node('scripts/restore.mjs', [archive]);
    expect(refused.status).toBe(1);
    expect(refused.output).toContain('The installation is not empty');

    // Wipe: an empty database and no uploads.
    await admin('postgres', async (c) => {
      await c.query(`drop database ${DB} with (force)`);
      await c.query(`create database ${DB} owner sluice`);
    });
    fs.rmSync(uploadsDir, { recursive: true, force: true });
    expect(await tableCounts()).toEqual({});

    const restored = node('scripts/restore.mjs', [archive]);
    expect(restored.status, restored.output).toBe(0);
    expect(await tableCounts()).toEqual(countsBefore);
    expect(uploadHashes()).toEqual(hashesBefore);
  });

  it('refuses a damaged archive before touching anything', async () => {
    const work = path.join(runDir, 'damaged');
    fs.mkdirSync(work, { recursive: true });
    expect(spawnSync('tar', ['-xzf', archive, '-C', work]).status).toBe(0);
    const manifest = JSON.parse(fs.readFileSync(path.join(work, 'manifest.json'), 'utf8'));
    const victim = path.join(work, manifest.files[0].path);
    fs.appendFileSync(victim, 'x');
    const damaged = path.join(runDir, 'damaged.tar.gz');
    expect(spawnSync('tar', ['-czf', damaged, '-C', work, '.']).status).toBe(0);
    const r = node('scripts/restore.mjs', [damaged, '--force']);
    expect(r.status).toBe(1);
    expect(r.output).toContain(`is damaged: 1 file(s) missing or not matching the manifest's SHA-256, e.g. ${manifest.files[0].path}`);
  });
});

// npm run backup [-- --out FILE] — one archive (tar.gz) of the whole installation: a pg_dump of
// the database, every raw upload, and manifest.json with the row count of every table and the
// SHA-256 of every file. The dump and the counts come from one snapshot, so the app may run.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { DUMP, FORMAT, FORMAT_VERSION, MANIFEST, countRows, databaseName, installation, listUploads, runPgTool, sha256File } from './backup-lib.mjs';
import { ROOT, fail, log } from './setup-lib.mjs';

const args = process.argv.slice(2);
const outAt = args.indexOf('--out');
const stamp = new Date().toISOString().replace(/[-:]/g, '').replace('T', '-').slice(0, 15);
const out = path.resolve(outAt >= 0 ? args[outAt + 1] ?? fail('--out needs a file name') : path.join(ROOT, 'backups', `sluice-backup-${stamp}.tar.gz`));

const { url, uploadsDir, bin } = await installation();
const work = fs.mkdtempSync(path.join(os.tmpdir(), 'sluice-backup-'));
process.on('exit', () => fs.rmSync(work, { recursive: true, force: true }));
try {
  // One snapshot for the counts and the dump: pg_dump joins the exported snapshot.
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  await client.query('begin isolation level repeatable read read only');
  const { rows } = await client.query('select pg_export_snapshot() as id, current_setting(\'server_version\') as version');
  const tables = await countRows(client);
  log(`dumping database ${databaseName(url)} (${Object.keys(tables).length} tables)`);
  runPgTool(bin, 'pg_dump', ['--format=custom', '--no-owner', '--no-privileges', `--snapshot=${rows[0].id}`, '--file', path.join(work, DUMP), '--dbname', url]);
  await client.query('commit');
  await client.end();

  // Uploads are only ever added: listed after the dump, every file a dumped row names is here.
  const files = listUploads(uploadsDir).map((rel) => {
    const abs = path.join(uploadsDir, rel);
    const sha256 = sha256File(abs);
    const named = path.basename(rel);
    if (/^[0-9a-f]{64}$/.test(named) && named !== sha256) log(`warning: uploads/${rel} does not hold the bytes its name says (SHA-256 ${sha256}); kept as it is`);
    return { path: `uploads/${rel}`, bytes: fs.statSync(abs).size, sha256 };
  });
  const manifest = {
    format: FORMAT,
    version: FORMAT_VERSION,
    created_at: new Date().toISOString(),
    commit: spawnSync('git', ['rev-parse', 'HEAD'], { cwd: ROOT, encoding: 'utf8' }).stdout.trim() || null,
    database: { name: databaseName(url), server_version: rows[0].version, file: DUMP, sha256: sha256File(path.join(work, DUMP)), tables },
    uploads: { count: files.length, bytes: files.reduce((s, f) => s + f.bytes, 0) },
    files,
  };
  fs.writeFileSync(path.join(work, MANIFEST), JSON.stringify(manifest, null, 2) + '\n');
  // The uploads go in through a link, so that they are not copied twice on disk.
  fs.symlinkSync(uploadsDir, path.join(work, 'uploads'));
  const list = path.join(work, 'files.txt');
  fs.writeFileSync(list, [MANIFEST, DUMP, ...files.map((f) => f.path)].join('\n') + '\n');
  fs.mkdirSync(path.dirname(out), { recursive: true });
  const partial = `${out}.part`;
  const tar = spawnSync('tar', ['--create', '--gzip', '--dereference', '--file', partial, '--directory', work, '--files-from', list], { encoding: 'utf8' });
  if (tar.status !== 0) fail(`tar failed: ${tar.stderr}`);
  fs.renameSync(partial, out);
  const rowsTotal = Object.values(tables).reduce((s, n) => s + n, 0);
  log(`backup written: ${out} (${(fs.statSync(out).size / 1e6).toFixed(1)} MB; ${rowsTotal} rows in ${Object.keys(tables).length} tables, ${files.length} uploads)`);
} finally {
  fs.rmSync(work, { recursive: true, force: true });
}

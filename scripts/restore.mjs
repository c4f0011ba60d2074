// npm run restore ARCHIVE [-- --force] — brings a `npm run backup` archive back: checks every
// SHA-256 in its manifest first, restores the database and the raw uploads, then compares
// every table's row count and every file's hash with the manifest. Only into an empty
// installation (no rows, no uploads) unless --force, which replaces what is there.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { DUMP, FORMAT, MANIFEST, countRows, databaseName, installation, listUploads, runPgTool, sha256File } from './backup-lib.mjs';
import { fail, log } from './setup-lib.mjs';

const args = process.argv.slice(2);
const force = args.includes('--force');
const archive = args.find((a) => !a.startsWith('--'));
if (!archive) fail('usage: npm run restore ARCHIVE [-- --force]   (ARCHIVE: a .tar.gz written by npm run backup)');
if (!fs.existsSync(archive)) fail(`${archive}: no such file.`);

const work = fs.mkdtempSync(path.join(os.tmpdir(), 'sluice-restore-'));
process.on('exit', () => fs.rmSync(work, { recursive: true, force: true }));
let code = 0;
try {
  const tar = spawnSync('tar', ['--extract', '--gzip', '--no-same-owner', '--no-same-permissions', '--file', path.resolve(archive), '--directory', work], { encoding: 'utf8' });
  if (tar.status !== 0) fail(`${archive}: not a readable tar.gz archive (${tar.stderr.trim()}).`);
  const manifestFile = path.join(work, MANIFEST);
  if (!fs.existsSync(manifestFile)) fail(`${archive}: no ${MANIFEST} inside; not an archive written by npm run backup.`);
  const manifest = JSON.parse(fs.readFileSync(manifestFile, 'utf8'));
  if (manifest.format !== FORMAT) fail(`${archive}: ${MANIFEST} is not a Sluice backup manifest (format "${manifest.format}").`);

  // Nothing is touched before the whole archive is known to be intact.
  const damaged = [];
  if (sha256File(path.join(work, DUMP)) !== manifest.database.sha256) damaged.push(DUMP);
  for (const f of manifest.files) {
    const abs = path.join(work, f.path);
    if (!fs.existsSync(abs) || sha256File(abs) !== f.sha256) damaged.push(f.path);
  }
  if (damaged.length) fail(`${archive} is damaged: ${damaged.length} file(s) missing or not matching the manifest's SHA-256, e.g. ${damaged.slice(0, 5).join(', ')}. Nothing was restored.`);
  log(`archive intact: database dump and ${manifest.files.length} uploads match the manifest (made ${manifest.created_at})`);

  const { url, uploadsDir, bin } = await installation();
  const db = databaseName(url);
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  const others = await client.query('select count(*)::int as n from pg_stat_activity where datname = current_database() and pid <> pg_backend_pid()');
  if (others.rows[0].n > 0) {
    fail(`database ${db} has ${others.rows[0].n} other connection(s): stop Sluice (Ctrl-C where npm start runs, and every worker) before restoring.`);
  }
  const before = await countRows(client);
  const rowsBefore = Object.entries(before).filter(([t]) => !t.startsWith('drizzle.')).reduce((s, [, n]) => s + n, 0);
  const uploadsBefore = listUploads(uploadsDir);
  if ((rowsBefore > 0 || uploadsBefore.length > 0) && !force) {
    fail(
      `The installation is not empty: database ${db} holds ${rowsBefore} rows and ${uploadsDir} holds ${uploadsBefore.length} files.\n` +
        `  Restore into an empty installation (a fresh clone, or a new DATABASE_URL and SLUICE_UPLOADS_DIR),\n` +
        `  or run again with --force to replace everything in it (back it up first: npm run backup).`,
    );
  }
  log(`restoring database ${db}${rowsBefore ? ` (replacing ${rowsBefore} rows)` : ''}`);
  runPgTool(bin, 'pg_restore', ['--clean', '--if-exists', '--no-owner', '--no-privileges', '--single-transaction', '--exit-on-error', '--dbname', url, path.join(work, DUMP)]);

  if (force) {
    // Files that are not in the archive would name rows that no longer exist.
    const keep = new Set(manifest.files.map((f) => f.path.replace(/^uploads\//, '')));
    for (const rel of uploadsBefore) if (!keep.has(rel)) fs.rmSync(path.join(uploadsDir, rel));
  }
  for (const f of manifest.files) {
    const target = path.join(uploadsDir, f.path.replace(/^uploads\//, ''));
    fs.mkdirSync(path.dirname(target), { recursive: true });
    const temp = `${target}.restore.part`;
    fs.copyFileSync(path.join(work, f.path), temp);
    fs.renameSync(temp, target);
  }

  // The check: the restored installation holds what the manifest says, table by table and file by file.
  const after = await countRows(client);
  await client.end();
  const wrongTables = Object.entries(manifest.database.tables).filter(([t, n]) => after[t] !== n).map(([t, n]) => `${t}: ${after[t] ?? 'missing'} rows, expected ${n}`);
  const wrongFiles = manifest.files.filter((f) => sha256File(path.join(uploadsDir, f.path.replace(/^uploads\//, ''))) !== f.sha256).map((f) => f.path);
  if (wrongTables.length || wrongFiles.length) {
    console.error(`[sluice] the restored installation differs from the archive:\n  ${[...wrongTables, ...wrongFiles.map((p) => `${p}: SHA-256 differs`)].join('\n  ')}`);
    code = 1;
  } else {
    const rows = Object.values(after).reduce((s, n) => s + n, 0);
    log(`restored and checked: ${rows} rows in ${Object.keys(after).length} tables, ${manifest.files.length} uploads; start Sluice with npm start`);
  }
} finally {
  fs.rmSync(work, { recursive: true, force: true });
}
process.exit(code);

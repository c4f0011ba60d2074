// npm test — the same set-up as `npm start`, against a fresh test database, then every suite:
// unit (pure code), integration (real PostgreSQL, real HTTP, real SMTP sink) and browser
// (Debian's Chromium driven by playwright-core), then the fault drills (scripts/test-faults.mjs).
import fs from 'node:fs';
import path from 'node:path';
import {
  DATA_DIR, ROOT, aptInstall, capture, databaseUrl, dropDatabase, ensureDatabases, ensureNodeModules, ensurePostgresInstalled,
  ensureSecrets, fail, log, portInUse, run, startChild, startCluster, waitForHttp, waitForPort, which,
} from './setup-lib.mjs';

// node scripts/test.mjs [unit|integration|e2e|faults] [test files...]
// SLUICE_TEST_DB, SLUICE_TEST_PORT, SLUICE_TEST_SMTP_PORT and SLUICE_BUILD_DIR let several
// engineers run the suites side by side on one machine.
const only = process.argv[2];
const files = process.argv.slice(3);
const TEST_DB = process.env.SLUICE_TEST_DB ?? 'sluice_test';
const BUILD_DIR = process.env.SLUICE_BUILD_DIR ?? 'dist';
const PORT = Number(process.env.SLUICE_TEST_PORT ?? 4399);
const SMTP_PORT = Number(process.env.SLUICE_TEST_SMTP_PORT ?? 2599);

ensureNodeModules();
const missing = [];
if (!which('chromium')) missing.push('chromium');
if (!which('ngspice')) missing.push('ngspice');
if (capture('/usr/bin/python3', ['-c', 'import scipy']).status !== 0) missing.push('python3-scipy');
if (missing.length) aptInstall(missing, 'the test suites');

const secrets = ensureSecrets();
const bin = ensurePostgresInstalled();
await startCluster(bin);
ensureDatabases(bin, secrets.SLUICE_DB_PASSWORD, ['sluice', 'sluice_test']);
dropDatabase(bin, TEST_DB);
ensureDatabases(bin, secrets.SLUICE_DB_PASSWORD, [TEST_DB]);

const runDir = path.join(DATA_DIR, TEST_DB === 'sluice_test' ? 'test' : TEST_DB);
const mailDir = path.join(runDir, 'mail');
const uploadsDir = path.join(runDir, 'uploads');
fs.rmSync(mailDir, { recursive: true, force: true });
fs.rmSync(uploadsDir, { recursive: true, force: true });
const env = {
  NODE_ENV: 'production',
  HOST: '127.0.0.1',
  PORT: String(PORT),
  DATABASE_URL: databaseUrl(secrets.SLUICE_DB_PASSWORD, TEST_DB),
  SLUICE_BUILD_DIR: BUILD_DIR,
  BETTER_AUTH_SECRET: secrets.BETTER_AUTH_SECRET,
  SMTP_HOST: '127.0.0.1',
  SMTP_PORT: String(SMTP_PORT),
  SLUICE_MAIL_SINK_DIR: mailDir,
  SLUICE_UPLOADS_DIR: uploadsDir,
  SLUICE_SIGN_IN_LIMIT_PER_MINUTE: '300',
  SLUICE_TEST_BASE_URL: `http://127.0.0.1:${PORT}`,
  SLUICE_DEMO_PASSWORD: 'weir-street-demo',
};
const envAll = { ...process.env, ...env };
const bins = path.join(ROOT, 'node_modules', '.bin');
const reportsDir = path.join(runDir, 'reports');
const logsDir = path.join(runDir, 'logs');
fs.rmSync(reportsDir, { recursive: true, force: true });
fs.mkdirSync(reportsDir, { recursive: true });

function vitest(suite, config) {
  log(`running the ${suite} tests`);
  return run(path.join(bins, 'vitest'), ['run', '--config', config, ...files, '--reporter=default', '--reporter=json', `--outputFile.json=${path.join(reportsDir, `${suite}.json`)}`], {
    env: envAll,
    allowFail: true,
  }).status;
}

const statuses = [];
if (!only || only === 'unit') statuses.push(vitest('unit', 'vitest.config.ts'));

const children = [];
const appChildren = [];
// A set-up step that fails (a build error) exits at once: the servers started so far go too.
process.on('exit', () => {
  for (const c of [...children, ...appChildren]) if (c.exitCode === null && c.signalCode === null) c.kill('SIGTERM');
});
/** A freshly created, migrated and seeded test database: each suite starts from the demo scenario alone. */
function freshDatabase() {
  dropDatabase(bin, TEST_DB);
  ensureDatabases(bin, secrets.SLUICE_DB_PASSWORD, [TEST_DB]);
  fs.rmSync(uploadsDir, { recursive: true, force: true });
  run(path.join(bins, 'tsx'), ['scripts/migrate.ts'], { env: envAll });
  run(path.join(bins, 'tsx'), ['scripts/seed-demo.ts'], { env: envAll });
}
async function startApp(suite) {
  appChildren.push(startChild('worker', path.join(bins, 'tsx'), ['src/worker.ts'], env, path.join(logsDir, `${suite}-worker.log`)));
  appChildren.push(startChild('web', process.execPath, [path.join(ROOT, BUILD_DIR, 'server', 'entry.mjs')], env, path.join(logsDir, `${suite}-web.log`)));
  await waitForHttp(`${env.SLUICE_TEST_BASE_URL}/api/health`, 120_000);
}
async function stopApp() {
  const exits = appChildren.map((c) => new Promise((r) => (c.exitCode !== null ? r() : c.once('exit', r))));
  for (const c of appChildren) c.kill('SIGTERM');
  await Promise.race([Promise.all(exits), new Promise((r) => setTimeout(r, 15_000))]);
  appChildren.length = 0;
}
if (!only || only !== 'unit') {
  for (const port of [PORT, SMTP_PORT]) if (await portInUse(port)) fail(`Port ${port} is in use; the test servers need it. Set SLUICE_TEST_PORT / SLUICE_TEST_SMTP_PORT.`);
  children.push(startChild('mail', path.join(bins, 'tsx'), ['scripts/mail-sink.ts'], env, path.join(logsDir, 'mail.log')));
  await waitForPort(SMTP_PORT);
  log('building the app');
  run(path.join(bins, 'astro'), ['build'], { env: envAll });
  for (const [suite, config] of [['integration', 'tests/integration/vitest.config.ts'], ['e2e', 'tests/e2e/vitest.config.ts']]) {
    if (only && only !== suite) continue;
    freshDatabase();
    await startApp(suite);
    statuses.push(vitest(suite, config));
    await stopApp();
  }
  for (const c of children) c.kill('SIGTERM');
  log(`server, worker and mail-sink logs of this run: ${path.relative(ROOT, logsDir)}/`);
  if (!only || only === 'faults') {
    // Their own PostgreSQL cluster and ports: the drills restart the database and kill processes.
    log('running the fault drills');
    const faultsEnv = { ...envAll, SLUICE_FAULTS_REPORT: path.join(reportsDir, 'faults.json') };
    statuses.push(run(process.execPath, ['scripts/test-faults.mjs', ...files], { env: faultsEnv, allowFail: true }).status);
  }
}

let passed = 0;
let failed = 0;
let skipped = 0;
// A test file that fails before any test runs (a syntax or import error) has no tests to count.
let unrunnable = 0;
for (const name of fs.readdirSync(reportsDir)) {
  const r = JSON.parse(fs.readFileSync(path.join(reportsDir, name), 'utf8'));
  passed += r.numPassedTests;
  failed += r.numFailedTests;
  skipped += r.numPendingTests + (r.numTodoTests ?? 0);
  unrunnable += (r.testResults ?? []).filter((t) => t.status === 'failed' && (t.assertionResults ?? []).length === 0).length;
}
const bad = statuses.some((s) => s !== 0);
console.log(
  `\n${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}${unrunnable ? `, ${unrunnable} test file(s) could not run` : ''}`,
);
setTimeout(() => process.exit(bad || failed > 0 || passed === 0 ? 1 : 0), 300);

// npm start — sets everything up on this machine and runs Sluice:
// dependencies, PostgreSQL on loopback, migrations, the demo scenario, the build, then the
// mail sink, one fitting worker and the web server, each restarted with a back-off when it
// dies. Ctrl-C stops the app; data stays.
import fs from 'node:fs';
import path from 'node:path';
import {
  DATA_DIR, ROOT, databaseUrl, ensureDatabases, ensureNodeModules, ensurePostgresInstalled, ensureSecrets, fail, log,
  portInUse, run, startChild, startCluster, waitForHttp, waitForPort,
} from './setup-lib.mjs';
import { supervise } from './supervise.mjs';

const dev = process.argv.includes('--dev');
const HOST = process.env.HOST ?? '127.0.0.1';
const PORT = Number(process.env.PORT ?? 4321);
const SMTP_PORT = Number(process.env.SMTP_PORT ?? 2525);
const externalSmtp = Boolean(process.env.SMTP_HOST && process.env.SMTP_HOST !== '127.0.0.1');

ensureNodeModules();
const secrets = ensureSecrets();
const bin = ensurePostgresInstalled();
await startCluster(bin);
ensureDatabases(bin, secrets.SLUICE_DB_PASSWORD, ['sluice', 'sluice_test']);

if (await portInUse(PORT)) fail(`Port ${PORT} on 127.0.0.1 is in use (is Sluice already running?). Stop it, or run: PORT=4322 npm start`);

const env = {
  NODE_ENV: dev ? 'development' : 'production',
  HOST,
  PORT: String(PORT),
  DATABASE_URL: process.env.DATABASE_URL ?? databaseUrl(secrets.SLUICE_DB_PASSWORD, 'sluice'),
  BETTER_AUTH_SECRET: process.env.BETTER_AUTH_SECRET ?? secrets.BETTER_AUTH_SECRET,
  SMTP_PORT: String(SMTP_PORT),
  ...(externalSmtp ? {} : { SLUICE_MAIL_SINK_DIR: process.env.SLUICE_MAIL_SINK_DIR ?? path.join(DATA_DIR, 'mail') }),
};
const tsx = path.join(ROOT, 'node_modules', '.bin', 'tsx');
const astro = path.join(ROOT, 'node_modules', '.bin', 'astro');
const envAll = { ...process.env, ...env };

run(tsx, ['scripts/migrate.ts'], { env: envAll });

// Each child is supervised: one that dies is started again after a back-off, and the others
// go on. Ctrl-C (or SIGTERM) stops them all.
const children = [];
let stoppingAll = false;
async function stopAll(code = 0) {
  if (stoppingAll) return;
  stoppingAll = true;
  log('stopping the web server, the worker and the mail sink');
  await Promise.all(children.map((c) => c.stop(10_000)));
  process.exit(code);
}
process.on('SIGINT', () => stopAll(0));
process.on('SIGTERM', () => stopAll(0));
const keep = (name, cmd, args) => children.push(supervise(name, () => startChild(name, cmd, args, env)));

if (!externalSmtp) {
  if (await portInUse(SMTP_PORT)) fail(`Port ${SMTP_PORT} (the local mail sink) is in use. Stop that program, or run: SMTP_PORT=2535 npm start`);
  keep('mail', process.execPath, ['--import', 'tsx', 'scripts/mail-sink.ts']);
  await waitForPort(SMTP_PORT);
}

run(tsx, ['scripts/seed-demo.ts'], { env: envAll });

if (dev) {
  keep('worker', process.execPath, ['--import', 'tsx', 'src/worker.ts']);
  keep('web', astro, ['dev', '--host', HOST, '--port', String(PORT)]);
} else {
  log('building the app');
  run(astro, ['build'], { env: envAll });
  keep('worker', process.execPath, ['--import', 'tsx', 'src/worker.ts']);
  keep('web', process.execPath, [path.join(ROOT, 'dist', 'server', 'entry.mjs')]);
}
await waitForHttp(`http://${HOST}:${PORT}/api/health`, 120_000);
const password = process.env.SLUICE_DEMO_PASSWORD ?? 'weir-street-demo';
console.log(`
  Sluice is running at http://${HOST}:${PORT}

  Demo accounts (password: ${password}):
    admin@demo.sluice.test      inspector@demo.sluice.test
    designer@demo.sluice.test   stores@demo.sluice.test
${externalSmtp ? '' : `  Mail goes to the local sink: read it at http://${HOST}:${PORT}/dev/mail (as admin)\n`}
  Ctrl-C stops the app; \`npm run stop\` also stops its PostgreSQL. Data stays in .data/ and uploads/.
`);
fs.writeFileSync(path.join(DATA_DIR, 'app.pid'), String(process.pid));

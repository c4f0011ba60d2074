// npm start — sets everything up on this machine and runs Sluice:
// dependencies, PostgreSQL on loopback, migrations, the demo scenario, the build, then the
// mail sink, one fitting worker and the web server. Ctrl-C stops the app; data stays.
import fs from 'node:fs';
import path from 'node:path';
import {
  DATA_DIR, ROOT, databaseUrl, ensureDatabases, ensureNodeModules, ensurePostgresInstalled, ensureSecrets, fail, log,
  portInUse, run, startChild, startCluster, waitForHttp, waitForPort,
} from './setup-lib.mjs';

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

const children = [];
function stopAll(code = 0) {
  for (const c of children) c.kill('SIGTERM');
  setTimeout(() => process.exit(code), 500).unref();
}
process.on('SIGINT', () => stopAll(0));
process.on('SIGTERM', () => stopAll(0));

if (!externalSmtp) {
  if (await portInUse(SMTP_PORT)) fail(`Port ${SMTP_PORT} (the local mail sink) is in use. Stop that program, or run: SMTP_PORT=2535 npm start`);
  children.push(startChild('mail', tsx, ['scripts/mail-sink.ts'], env));
  await waitForPort(SMTP_PORT);
}

run(tsx, ['scripts/seed-demo.ts'], { env: envAll });

if (dev) {
  children.push(startChild('worker', tsx, ['src/worker.ts'], env));
  children.push(startChild('web', astro, ['dev', '--host', HOST, '--port', String(PORT)], env));
} else {
  log('building the app');
  run(astro, ['build'], { env: envAll });
  children.push(startChild('worker', tsx, ['src/worker.ts'], env));
  children.push(startChild('web', process.execPath, [path.join(ROOT, 'dist', 'server', 'entry.mjs')], env));
}
for (const c of children) {
  c.on('exit', (code, signal) => {
    if (signal !== 'SIGTERM') {
      console.error(`[sluice] a process stopped unexpectedly (exit ${code ?? signal}); stopping the rest.`);
      stopAll(1);
    }
  });
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

// npm run db:start | db:stop | db:status — the project's own PostgreSQL cluster on loopback.
import {
  PG_PORT, clusterRunning, ensureDatabases, ensurePostgresInstalled, ensureSecrets, log, startCluster, stopCluster,
} from './setup-lib.mjs';

const command = process.argv[2];
const bin = ensurePostgresInstalled();
if (command === 'start') {
  const secrets = ensureSecrets();
  await startCluster(bin);
  ensureDatabases(bin, secrets.SLUICE_DB_PASSWORD, ['sluice', 'sluice_test']);
  log(`PostgreSQL is running on 127.0.0.1:${PG_PORT}`);
} else if (command === 'stop') {
  stopCluster(bin);
} else if (command === 'status') {
  log(clusterRunning(bin) ? `PostgreSQL is running on 127.0.0.1:${PG_PORT}` : 'PostgreSQL is not running');
} else {
  console.error('usage: node scripts/db.mjs start|stop|status');
  process.exit(2);
}

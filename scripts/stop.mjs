// npm run stop — stops the project's PostgreSQL (the app itself stops with Ctrl-C).
import { ensurePostgresInstalled, stopCluster } from './setup-lib.mjs';

stopCluster(ensurePostgresInstalled());

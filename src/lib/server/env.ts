import os from 'node:os';
import { z } from 'zod';
import { AppError } from '~/core/errors';
import { DbEnvSchema } from '~/db/db-config';

/**
 * Process configuration, parsed once. Every variable has a safe default for a local install;
 * `scripts/start.mjs` and `scripts/test.mjs` set the secret and the database URL.
 */
export const EnvSchema = z.object({
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().positive().default(4321),
  SLUICE_PUBLIC_URL: z.string().url().optional(),
  ...DbEnvSchema.shape,
  BETTER_AUTH_SECRET: z.string().min(32, 'BETTER_AUTH_SECRET must be at least 32 characters').optional(),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().positive().default(2525),
  SMTP_SECURE: z.enum(['0', '1']).default('0'),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().default('Sluice <sluice@localhost>'),
  /** Set by the start command when it runs the local mail sink: enables the dev mail page. */
  SLUICE_MAIL_SINK_DIR: z.string().optional(),
  SLUICE_UPLOADS_DIR: z.string().default('uploads'),
  SLUICE_SIGN_IN_LIMIT_PER_MINUTE: z.coerce.number().int().positive().default(30),
  SLUICE_SIGN_IN_FAILURES_PER_ACCOUNT: z.coerce.number().int().positive().default(5),
  SLUICE_SIGN_IN_FAILURES_PER_ADDRESS: z.coerce.number().int().positive().default(20),
  SLUICE_SIGN_IN_FAILURE_WINDOW_MINUTES: z.coerce.number().positive().default(15),
  SLUICE_RESERVATION_DAYS: z.coerce.number().positive().default(3),
  /** Parallel fitting fetch loops in each worker process. */
  SLUICE_FIT_LOOPS: z.coerce.number().int().nonnegative().default(2),
  /** Extra threads that evaluate a large stock's figures for matching; 0 turns them off. */
  SLUICE_MATCH_THREADS: z.coerce.number().int().min(0).max(16).optional(),
});

export interface ServerEnv {
  host: string;
  port: number;
  publicUrl: string;
  trustedOrigins: string[];
  databaseUrl: string;
  dbPoolSize: number;
  authSecret: string;
  smtp: { host: string; port: number; secure: boolean; user?: string; password?: string };
  mailFrom: string;
  mailSinkDir: string | undefined;
  uploadsDir: string;
  signInLimitPerMinute: number;
  signInFailuresPerAccount: number;
  signInFailuresPerAddress: number;
  signInFailureWindowS: number;
  reservationDays: number;
  fitLoops: number;
  matchThreads: number;
}

let cached: ServerEnv | undefined;

export function serverEnv(): ServerEnv {
  if (cached) return cached;
  const parsed = EnvSchema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new AppError('configuration_invalid', { lines });
  }
  const e = parsed.data;
  const publicUrl = (e.SLUICE_PUBLIC_URL ?? `http://${e.HOST}:${e.PORT}`).replace(/\/$/, '');
  const trustedOrigins = [...new Set([publicUrl, `http://127.0.0.1:${e.PORT}`, `http://localhost:${e.PORT}`])];
  if (!e.BETTER_AUTH_SECRET) {
    throw new AppError('auth_secret_missing');
  }
  cached = {
    host: e.HOST,
    port: e.PORT,
    publicUrl,
    trustedOrigins,
    databaseUrl: e.DATABASE_URL,
    dbPoolSize: e.SLUICE_DB_POOL_SIZE,
    authSecret: e.BETTER_AUTH_SECRET,
    smtp: {
      host: e.SMTP_HOST,
      port: e.SMTP_PORT,
      secure: e.SMTP_SECURE === '1',
      user: e.SMTP_USER,
      password: e.SMTP_PASSWORD,
    },
    mailFrom: e.MAIL_FROM,
    mailSinkDir: e.SLUICE_MAIL_SINK_DIR,
    uploadsDir: e.SLUICE_UPLOADS_DIR,
    signInLimitPerMinute: e.SLUICE_SIGN_IN_LIMIT_PER_MINUTE,
    signInFailuresPerAccount: e.SLUICE_SIGN_IN_FAILURES_PER_ACCOUNT,
    signInFailuresPerAddress: e.SLUICE_SIGN_IN_FAILURES_PER_ADDRESS,
    signInFailureWindowS: Math.round(e.SLUICE_SIGN_IN_FAILURE_WINDOW_MINUTES * 60),
    reservationDays: e.SLUICE_RESERVATION_DAYS,
    fitLoops: e.SLUICE_FIT_LOOPS,
    matchThreads: e.SLUICE_MATCH_THREADS ?? Math.min(Math.max(os.availableParallelism() - 1, 0), 3),
  };
  return cached;
}

import type { APIRoute } from 'astro';
import type { HealthJson } from '~/contracts/session';
import { AppError, errorBody, json } from '~/lib/server/errors';
import { checkHealth } from '~/lib/server/services/health/check-health';

export const GET: APIRoute = async () => {
  const { databaseAnswers } = await checkHealth();
  if (databaseAnswers) return json({ ok: true } satisfies HealthJson);
  return json({ ok: false, ...errorBody(new AppError('database_unreachable')) }, 503);
};

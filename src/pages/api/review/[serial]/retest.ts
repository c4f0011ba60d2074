import { endpoint, readJson } from '~/lib/server/http';
import { markForRetest } from '~/lib/server/services/review/retest';

export const POST = endpoint(async ({ params, request }, actor) => {
  const body = (await readJson(request)) as Record<string, unknown>;
  return markForRetest({ actor, input: { ...body, serial: params.serial } });
});

import { endpoint, readJson } from '~/lib/server/http';
import { refitWithExclusions } from '~/lib/server/services/review/refit';

export const POST = endpoint(async ({ params, request }, actor) => {
  const body = (await readJson(request)) as Record<string, unknown>;
  return refitWithExclusions({ actor, input: { ...body, serial: params.serial } });
});

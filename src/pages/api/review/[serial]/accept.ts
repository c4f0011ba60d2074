import { endpoint, readJson } from '~/lib/server/http';
import { acceptFit } from '~/lib/server/services/review/accept';

export const POST = endpoint(async ({ params, request }, actor) => {
  const body = (await readJson(request)) as Record<string, unknown>;
  return acceptFit({ actor, input: { ...body, serial: params.serial } });
});

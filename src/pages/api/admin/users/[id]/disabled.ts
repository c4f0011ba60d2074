import { endpoint, readJson } from '~/lib/server/http';
import { setUserDisabled } from '~/lib/server/services/users/set-disabled';

export const PUT = endpoint(async ({ request, params }, actor) => {
  const body = (await readJson(request)) as Record<string, unknown>;
  return setUserDisabled({ actor, input: { ...body, userId: params.id } });
});

import { endpoint, readJson } from '~/lib/server/http';
import { setUserRoles } from '~/lib/server/services/users/set-roles';

export const PUT = endpoint(async ({ request, params }, actor) => {
  const body = (await readJson(request)) as Record<string, unknown>;
  return setUserRoles({ actor, input: { ...body, userId: params.id } });
});

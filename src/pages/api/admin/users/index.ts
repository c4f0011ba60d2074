import { endpoint, json, readJson } from '~/lib/server/http';
import { inviteUser } from '~/lib/server/services/users/invite';
import { listUsers } from '~/lib/server/services/users/list';

export const GET = endpoint((_ctx, actor) => listUsers({ actor }).then((users) => ({ users })));

export const POST = endpoint(async ({ request }, actor) => json(await inviteUser({ actor, input: await readJson(request) }), 201));

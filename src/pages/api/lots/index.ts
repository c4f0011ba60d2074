import { endpoint, json, readJson } from '~/lib/server/http';
import { createLot } from '~/lib/server/services/lots/create';
import { listLots } from '~/lib/server/services/lots/list';

export const GET = endpoint((_ctx, actor) => listLots({ actor }).then((lots) => ({ lots })));

export const POST = endpoint(async ({ request }, actor) => json(await createLot({ actor, input: await readJson(request) }), 201));

import { endpoint, json, readJson } from '~/lib/server/http';
import { listLocations } from '~/lib/server/services/locations/list';
import { createLocation } from '~/lib/server/services/locations/save';

export const GET = endpoint((_ctx, actor) => listLocations({ actor }).then((locations) => ({ locations })));

export const POST = endpoint(async ({ request }, actor) => json(await createLocation({ actor, input: await readJson(request) }), 201));

import { endpoint, json, readJson } from '~/lib/server/http';
import { createStationToken } from '~/lib/server/services/stations/create';
import { listStations } from '~/lib/server/services/stations/list';

export const GET = endpoint((_ctx, actor) => listStations({ actor }).then((stations) => ({ stations })));

export const POST = endpoint(async ({ request }, actor) => json(await createStationToken({ actor, input: await readJson(request) }), 201));

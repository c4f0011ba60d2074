import { endpoint, json, readJson } from '~/lib/server/http';
import { createDeviceType } from '~/lib/server/services/device-types/create';
import { listDeviceTypes } from '~/lib/server/services/device-types/list';

export const GET = endpoint((_ctx, actor) => listDeviceTypes({ actor }).then((device_types) => ({ device_types })));

export const POST = endpoint(async ({ request }, actor) => json(await createDeviceType({ actor, input: await readJson(request) }), 201));

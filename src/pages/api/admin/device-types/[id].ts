import { endpoint, readJson } from '~/lib/server/http';
import { updateDeviceType } from '~/lib/server/services/device-types/update';

export const PUT = endpoint(async ({ params, request }, actor) => updateDeviceType({ actor, id: params.id, input: await readJson(request) }));

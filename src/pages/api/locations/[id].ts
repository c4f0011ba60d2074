import { endpoint, readJson, rowId } from '~/lib/server/http';
import { deleteLocation, updateLocation } from '~/lib/server/services/locations/save';

const locationId = (raw: string | undefined) => rowId(raw, 'location');

export const PUT = endpoint(async ({ params, request }, actor) => updateLocation({ actor, id: locationId(params.id), input: await readJson(request) }));

export const DELETE = endpoint(({ params }, actor) => deleteLocation({ actor, id: locationId(params.id) }));

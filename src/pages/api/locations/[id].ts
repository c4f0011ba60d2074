import { AppError } from '../../../lib/server/errors';
import { endpoint, readJson } from '../../../lib/server/http';
import { deleteLocation, updateLocation } from '../../../lib/server/services/locations/save';

function locationId(raw: string | undefined): number {
  const id = Number(raw);
  if (!Number.isInteger(id) || id <= 0) throw new AppError('invalid_input', `"${raw}" is not a location id.`);
  return id;
}

export const PUT = endpoint(async ({ params, request }, actor) => updateLocation({ actor, id: locationId(params.id), input: await readJson(request) }));

export const DELETE = endpoint(({ params }, actor) => deleteLocation({ actor, id: locationId(params.id) }));

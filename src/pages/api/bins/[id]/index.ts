import { AppError } from '../../../../lib/server/errors';
import { endpoint, readJson } from '../../../../lib/server/http';
import { getBin } from '../../../../lib/server/services/bins/get';
import { updateBin } from '../../../../lib/server/services/bins/update';

function binId(raw: string | undefined): number {
  const id = Number(raw);
  if (!Number.isInteger(id) || id <= 0) throw new AppError('invalid_input', `"${raw}" is not a bin id.`);
  return id;
}

export const GET = endpoint(({ params }, actor) => getBin({ actor, binId: binId(params.id) }));

/** Sets the bin's home location and/or low-stock threshold. */
export const PUT = endpoint(async ({ params, request }, actor) => updateBin({ actor, binId: binId(params.id), input: await readJson(request) }));

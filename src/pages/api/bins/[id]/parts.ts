import { AppError } from '../../../../lib/server/errors';
import { endpoint } from '../../../../lib/server/http';
import { searchParamsObject } from '../../../../lib/server/services/bins/schemas';
import { listPartsInBin } from '../../../../lib/server/services/bins/parts';

export const GET = endpoint(({ params, url }, actor) => {
  const id = Number(params.id);
  if (!Number.isInteger(id) || id <= 0) throw new AppError('invalid_input', `"${params.id}" is not a bin id.`);
  return listPartsInBin({ actor, binId: id, query: searchParamsObject(url.searchParams) });
});

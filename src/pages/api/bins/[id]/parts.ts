import { endpoint, rowId } from '~/lib/server/http';
import { searchParamsObject } from '~/lib/server/services/bins/schemas';
import { listPartsInBin } from '~/lib/server/services/bins/parts';

export const GET = endpoint(({ params, url }, actor) => {
  return listPartsInBin({ actor, binId: rowId(params.id, 'bin'), query: searchParamsObject(url.searchParams) });
});

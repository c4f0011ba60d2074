import { endpoint } from '~/lib/server/http';
import { listBinStock } from '~/lib/server/services/bins/list';
import { searchParamsObject } from '~/lib/server/services/bins/schemas';

/** Bins of the active plans with computed on_hand/reserved/issued; ?device_type=<id or name>. */
export const GET = endpoint(({ url }, actor) => listBinStock({ actor, query: searchParamsObject(url.searchParams) }));

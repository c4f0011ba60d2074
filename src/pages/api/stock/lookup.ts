import { endpoint } from '~/lib/server/http';
import { lookupPart } from '~/lib/server/services/stock/lookup';

/** ?serial=<scanned>: what the part is and what stores may do with it. */
export const GET = endpoint(({ url }, actor) => lookupPart({ actor, serial: url.searchParams.get('serial') ?? '' }));

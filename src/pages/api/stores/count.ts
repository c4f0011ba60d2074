import { endpoint, readJson } from '~/lib/server/http';
import { countLocationStock } from '~/lib/server/services/stock/count-location';

/** Compare a location's scanned parts with the records; `apply: true` corrects them in one transaction. */
export const POST = endpoint(async ({ request }, actor) => countLocationStock({ actor, input: await readJson(request) }));

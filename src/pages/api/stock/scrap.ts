import { endpoint, readJson } from '~/lib/server/http';
import { scrapParts } from '~/lib/server/services/stock/scrap';

/** One batch, one transaction; see the service for what is refused. */
export const POST = endpoint(async ({ request }, actor) => scrapParts({ actor, input: await readJson(request) }));

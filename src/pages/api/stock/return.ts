import { endpoint, readJson } from '~/lib/server/http';
import { returnParts } from '~/lib/server/services/stock/return';

/** One batch, one transaction; see the service for what is refused. */
export const POST = endpoint(async ({ request }, actor) => returnParts({ actor, input: await readJson(request) }));

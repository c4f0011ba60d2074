import { endpoint, readJson } from '~/lib/server/http';
import { receiveParts } from '~/lib/server/services/stock/receive';

/** One batch, one transaction; see the service for what is refused. */
export const POST = endpoint(async ({ request }, actor) => receiveParts({ actor, input: await readJson(request) }));

import { endpoint, readJson } from '~/lib/server/http';
import { moveParts } from '~/lib/server/services/stock/move';

/** One batch, one transaction; see the service for what is refused. */
export const POST = endpoint(async ({ request }, actor) => moveParts({ actor, input: await readJson(request) }));

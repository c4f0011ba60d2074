import { endpoint, readJson } from '~/lib/server/http';
import { returnPickedParts } from '~/lib/server/services/pick-lists/return-parts';

/** POST { serials, restock?, reason? }: take back parts issued through this list. */
export const POST = endpoint(async ({ params, request }, actor) => returnPickedParts({ actor, id: params.id!, input: await readJson(request) }));

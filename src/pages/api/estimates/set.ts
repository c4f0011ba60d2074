import { endpoint, readJson } from '~/lib/server/http';
import { estimateMatchedSet } from '~/lib/server/services/estimates/matched-set';

/** POST /api/estimates/set: every part of a reservation's sets (or of a serial list) at one operating point. */
export const POST = endpoint(async ({ request }, actor) => estimateMatchedSet({ actor, input: await readJson(request) }));

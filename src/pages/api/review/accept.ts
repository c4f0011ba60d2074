import { endpoint, readJson } from '~/lib/server/http';
import { acceptFits } from '~/lib/server/services/review/accept';

/** Accept several parts' fits in one transaction: { parts: [{ serial, fit_id }], note }. */
export const POST = endpoint(async ({ request }, actor) => acceptFits({ actor, input: await readJson(request) }));

import { endpoint, readJson } from '~/lib/server/http';
import { mailLotSummary } from '~/lib/server/services/uploads/lot-summary';

/** Mails one lot's summary of this upload to the supplier contact ({ lot, to }). */
export const POST = endpoint(async ({ params, request }, actor) => mailLotSummary({ actor, id: params.id, input: await readJson(request) }));

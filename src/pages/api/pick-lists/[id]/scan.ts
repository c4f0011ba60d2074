import { endpoint, readJson } from '~/lib/server/http';
import { scanPickLine } from '~/lib/server/services/pick-lists/scan-line';

/** POST { serial, line_no? }: confirm a line by its part's serial; 409 with `refusal` when refused. */
export const POST = endpoint(async ({ params, request }, actor) => scanPickLine({ actor, id: params.id!, input: await readJson(request) }));

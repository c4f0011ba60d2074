import { endpoint, json, readJson } from '~/lib/server/http';
import { createMatchProposal } from '~/lib/server/services/match/create-proposal';

/** POST: propose matched sets from stock (stored; confirm it to reserve). */
export const POST = endpoint(async ({ request }, actor) => json(await createMatchProposal({ actor, input: await readJson(request) }), 201));

import { endpoint, json, readJson } from '~/lib/server/http';
import { confirmMatchProposal } from '~/lib/server/services/match/confirm-proposal';

/** POST: reserve every part of the proposal (201), or 409 naming the parts already taken. */
export const POST = endpoint(async ({ params, request }, actor) =>
  json(await confirmMatchProposal({ actor, proposalId: params.id!, input: await readJson(request) }), 201),
);

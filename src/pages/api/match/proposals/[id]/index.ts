import { endpoint } from '~/lib/server/http';
import { getMatchProposal } from '~/lib/server/services/match/get-proposal';

export const GET = endpoint(({ params }, actor) => getMatchProposal({ actor, id: params.id! }));

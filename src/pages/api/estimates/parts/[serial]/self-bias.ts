import { endpoint, readJson } from '~/lib/server/http';
import { estimateSelfBias } from '~/lib/server/services/estimates/self-bias';
import { withSerial } from '~/lib/server/services/estimates/with-serial';

/** POST /api/estimates/parts/{serial}/self-bias: the self-bias estimate for a stored part's current fit. */
export const POST = endpoint(async ({ request, params }, actor) =>
  estimateSelfBias({ actor, input: withSerial(await readJson(request), params.serial) }),
);

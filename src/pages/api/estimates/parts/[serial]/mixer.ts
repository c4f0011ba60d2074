import { endpoint, readJson } from '~/lib/server/http';
import { estimateMixerProducts } from '~/lib/server/services/estimates/estimate-mixer';
import { withSerial } from '~/lib/server/services/estimates/with-serial';

/** POST /api/estimates/parts/{serial}/mixer: the mixer estimate for a stored part's current fit. */
export const POST = endpoint(async ({ request, params }, actor) =>
  estimateMixerProducts({ actor, input: withSerial(await readJson(request), params.serial) }),
);

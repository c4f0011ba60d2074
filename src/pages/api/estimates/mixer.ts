import { endpoint, readJson } from '~/lib/server/http';
import { estimateMixerProducts } from '~/lib/server/services/estimates/estimate-mixer';

/** POST /api/estimates/mixer: square-law mixer products for { idss_a, vp_v } or { serial }. */
export const POST = endpoint(async ({ request }, actor) => estimateMixerProducts({ actor, input: await readJson(request) }));

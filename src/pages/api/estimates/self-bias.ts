import { endpoint, readJson } from '~/lib/server/http';
import { estimateSelfBias } from '~/lib/server/services/estimates/self-bias';

/** POST /api/estimates/self-bias: source resistor for a current and/or current for a resistor. */
export const POST = endpoint(async ({ request }, actor) => estimateSelfBias({ actor, input: await readJson(request) }));

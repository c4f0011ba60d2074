import { endpoint, json, readJson } from '~/lib/server/http';
import { activateBinPlan } from '~/lib/server/services/bin-plans/activate';
import { listBinPlans } from '~/lib/server/services/bin-plans/list';

export const GET = endpoint(({ url }, actor) => listBinPlans({ actor, deviceType: url.searchParams.get('device_type') }));

/** Saves the plan as the type's next version and activates it (re-binning the moved parts). */
export const POST = endpoint(async ({ request }, actor) => json(await activateBinPlan({ actor, input: await readJson(request) }), 201));

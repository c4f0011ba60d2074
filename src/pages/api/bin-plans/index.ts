import { BinPlanListQuery } from '~/contracts/bin-plans';
import { endpoint, json, readJson } from '~/lib/server/http';
import { activateBinPlan } from '~/lib/server/services/bin-plans/activate';
import { listBinPlans } from '~/lib/server/services/bin-plans/list';

export const GET = endpoint(({ url }, actor) => {
  const query = BinPlanListQuery.parse({ device_type: url.searchParams.get('device_type') ?? undefined });
  return listBinPlans({ actor, deviceType: query.device_type });
});

/** Saves the plan as the type's next version and activates it (re-binning the moved parts). */
export const POST = endpoint(async ({ request }, actor) => json(await activateBinPlan({ actor, input: await readJson(request) }), 201));

import { endpoint, readJson } from '~/lib/server/http';
import { previewBinPlan } from '~/lib/server/services/bin-plans/preview';

/** What saving this plan would move; nothing is saved. */
export const POST = endpoint(async ({ request }, actor) => previewBinPlan({ actor, input: await readJson(request) }));

import { endpoint, rowId } from '~/lib/server/http';
import { getBinPlan } from '~/lib/server/services/bin-plans/list';

export const GET = endpoint(({ params }, actor) => {
  return getBinPlan({ actor, id: rowId(params.id, 'bin plan') });
});

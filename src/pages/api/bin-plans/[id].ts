import { AppError } from '../../../lib/server/errors';
import { endpoint } from '../../../lib/server/http';
import { getBinPlan } from '../../../lib/server/services/bin-plans/list';

export const GET = endpoint(({ params }, actor) => {
  const id = Number(params.id);
  if (!Number.isInteger(id) || id <= 0) throw new AppError('invalid_input', `"${params.id}" is not a bin plan id.`);
  return getBinPlan({ actor, id });
});

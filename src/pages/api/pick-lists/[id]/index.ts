import { endpoint } from '~/lib/server/http';
import { getPickList } from '~/lib/server/services/pick-lists/get';

export const GET = endpoint(({ params }, actor) => getPickList({ actor, id: params.id! }));

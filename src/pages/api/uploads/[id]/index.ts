import { endpoint } from '~/lib/server/http';
import { getUpload } from '~/lib/server/services/uploads/get';

export const GET = endpoint(({ params }, actor) => getUpload({ actor, id: params.id }));

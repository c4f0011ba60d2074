import { endpoint } from '~/lib/server/http';
import { listParts } from '~/lib/server/services/parts/list';

export const GET = endpoint(({ url }, actor) => listParts({ actor, input: Object.fromEntries(url.searchParams) }));

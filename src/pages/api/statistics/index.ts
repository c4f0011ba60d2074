import { endpoint } from '~/lib/server/http';
import { getStatistics } from '~/lib/server/services/statistics/get';
import { queryObject } from '~/lib/server/services/statistics/query-object';

/** GET /api/statistics?device_type=&lot=&from=&to=&date_basis=fit|lot&histogram_bins= */
export const GET = endpoint(({ url }, actor) => getStatistics({ actor, input: queryObject(url.searchParams) }));

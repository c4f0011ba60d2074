import { endpoint } from '~/lib/server/http';
import { listStatisticsOptions } from '~/lib/server/services/statistics/list-options';

/** GET /api/statistics/options: device types and lots to choose from. */
export const GET = endpoint((_ctx, actor) => listStatisticsOptions({ actor }));

import { endpoint } from '~/lib/server/http';
import { exportStatisticsCsv } from '~/lib/server/services/statistics/export-csv';
import { queryObject } from '~/lib/server/services/statistics/query-object';

/** GET /api/statistics/export?table=summary|histograms|scatter|yield|bins|trend&(the selection) → text/csv */
export const GET = endpoint(async ({ url }, actor) => {
  const { fileName, body } = await exportStatisticsCsv({ actor, input: queryObject(url.searchParams) });
  return new Response(body, {
    headers: { 'content-type': 'text/csv; charset=utf-8', 'content-disposition': `attachment; filename="${fileName}"` },
  });
});

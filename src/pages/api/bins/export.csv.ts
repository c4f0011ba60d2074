import { endpoint } from '~/lib/server/http';
import { binStockCsv } from '~/lib/server/services/bins/list';
import { searchParamsObject } from '~/lib/server/services/bins/schemas';

/** The bin stock table as CSV, every page, with the same filters and order. */
export const GET = endpoint(async ({ url }, actor) => {
  const csv = await binStockCsv({ actor, query: searchParamsObject(url.searchParams) });
  const day = new Date().toISOString().slice(0, 10);
  return new Response(csv, {
    headers: { 'content-type': 'text/csv; charset=utf-8', 'content-disposition': `attachment; filename="bin-stock-${day}.csv"` },
  });
});

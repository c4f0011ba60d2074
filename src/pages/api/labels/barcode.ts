import { endpoint } from '~/lib/server/http';
import { requirePermission } from '~/lib/server/identity';
import { BarcodeQuery } from '~/contracts/labels';
import { barcodePng, barcodeSvg } from '~/lib/server/services/labels/barcode';
import { searchParamsObject } from '~/lib/server/services/bins/schemas';

/** ?text=&symbology=code128|datamatrix&format=svg|png — a barcode rendered on the server. */
export const GET = endpoint(async ({ url }, actor) => {
  requirePermission(actor, 'stock:labels');
  const q = BarcodeQuery.parse(searchParamsObject(url.searchParams));
  const cache = { 'cache-control': 'private, max-age=86400' };
  if (q.format === 'png') {
    const png = await barcodePng(q.text, q.symbology);
    return new Response(new Uint8Array(png), { headers: { 'content-type': 'image/png', ...cache } });
  }
  return new Response(barcodeSvg(q.text, q.symbology), { headers: { 'content-type': 'image/svg+xml', ...cache } });
});

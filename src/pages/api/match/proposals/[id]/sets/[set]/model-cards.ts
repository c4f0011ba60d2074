import { endpoint } from '~/lib/server/http';
import { exportProposalSet } from '~/lib/server/services/reservations/export-set';

/** GET: the SPICE .model cards of one set (set numbers from 1), as a download. */
export const GET = endpoint(async ({ params }, actor) => {
  const file = await exportProposalSet({ actor, id: params.id!, setNo: Number(params.set), format: 'spice' });
  return new Response(file.body, {
    headers: { 'content-type': file.contentType, 'content-disposition': `attachment; filename="${file.filename}"` },
  });
});

import { endpoint } from '~/lib/server/http';
import { getPartModelCard } from '~/lib/server/services/parts/model-card';

export const GET = endpoint(async ({ params }, actor) => {
  const { text, fileName } = await getPartModelCard({ actor, serial: params.serial ?? '' });
  return new Response(text, {
    headers: { 'content-type': 'text/plain; charset=utf-8', 'content-disposition': `attachment; filename="${fileName}"` },
  });
});

import { endpoint } from '~/lib/server/http';
import { listPickLists } from '~/lib/server/services/pick-lists/list';

/** GET ?status=open|complete|cancelled|all (default open). */
export const GET = endpoint(({ url }, actor) =>
  listPickLists({ actor, input: { status: url.searchParams.get('status') ?? undefined } }).then((pick_lists) => ({ pick_lists })),
);

import { endpoint } from '~/lib/server/http';
import { listReviewQueue } from '~/lib/server/services/review/list-queue';

export const GET = endpoint(({ url }, actor) => listReviewQueue({ actor, input: Object.fromEntries(url.searchParams) }));

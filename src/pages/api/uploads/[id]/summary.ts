import { endpoint } from '~/lib/server/http';
import { getUploadLotSummary } from '~/lib/server/services/uploads/lot-summary';

/** The upload per lot: fitted, flagged, refused by reason. */
export const GET = endpoint(({ params }, actor) => getUploadLotSummary({ actor, id: params.id }));

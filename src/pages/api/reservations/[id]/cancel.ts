import { endpoint } from '~/lib/server/http';
import { cancelReservation } from '~/lib/server/services/reservations/cancel';

/** POST: cancel an active reservation; its parts go back to stock. */
export const POST = endpoint(({ params }, actor) => cancelReservation({ actor, id: params.id! }));

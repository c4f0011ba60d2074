import { endpoint } from '~/lib/server/http';
import { getReservation } from '~/lib/server/services/reservations/get';

export const GET = endpoint(({ params }, actor) => getReservation({ actor, id: params.id! }));

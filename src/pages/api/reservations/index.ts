import { endpoint } from '~/lib/server/http';
import { listReservations } from '~/lib/server/services/reservations/list';

export const GET = endpoint((_ctx, actor) => listReservations({ actor }).then((reservations) => ({ reservations })));

import { endpoint } from '~/lib/server/http';
import { getPartBySerial } from '~/lib/server/services/parts/get';

export const GET = endpoint(({ params }, actor) => getPartBySerial({ actor, serial: params.serial ?? '' }));

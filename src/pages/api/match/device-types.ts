import { endpoint } from '~/lib/server/http';
import { listMatchableTypes } from '~/lib/server/services/match/list-types';

export const GET = endpoint((_ctx, actor) => listMatchableTypes({ actor }).then((device_types) => ({ device_types })));

import { endpoint } from '~/lib/server/http';
import { listAwaitingReceipt } from '~/lib/server/services/stock/lookup';

export const GET = endpoint((_ctx, actor) => listAwaitingReceipt({ actor }));

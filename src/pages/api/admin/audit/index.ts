import { endpoint } from '~/lib/server/http';
import { listAuditLog } from '~/lib/server/services/audit/list';

export const GET = endpoint(({ url }, actor) => listAuditLog({ actor, input: Object.fromEntries(url.searchParams) }));

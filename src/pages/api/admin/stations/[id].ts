import { endpoint } from '~/lib/server/http';
import { revokeStationToken } from '~/lib/server/services/stations/revoke';

/** Revokes the station's token (the row is kept for the audit trail). */
export const DELETE = endpoint(({ params }, actor) => revokeStationToken({ actor, input: { id: params.id } }));

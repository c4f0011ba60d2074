import { endpoint, readJson, rowId } from '~/lib/server/http';
import { getBin } from '~/lib/server/services/bins/get';
import { updateBin } from '~/lib/server/services/bins/update';

const binId = (raw: string | undefined) => rowId(raw, 'bin');

export const GET = endpoint(({ params }, actor) => getBin({ actor, binId: binId(params.id) }));

/** Sets the bin's home location and/or low-stock threshold. */
export const PUT = endpoint(async ({ params, request }, actor) => updateBin({ actor, binId: binId(params.id), input: await readJson(request) }));

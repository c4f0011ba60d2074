import { BinMapQuery } from '~/contracts/bins';
import { AppError } from '~/lib/server/errors';
import { endpoint } from '~/lib/server/http';
import { getBinMap } from '~/lib/server/services/bins/map';

export const GET = endpoint(({ url }, actor) => {
  const query = BinMapQuery.safeParse({ device_type: url.searchParams.get('device_type') ?? undefined });
  if (!query.success) throw new AppError('bin_map_needs_type');
  return getBinMap({ actor, deviceType: query.data.device_type });
});

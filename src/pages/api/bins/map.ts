import { AppError } from '~/lib/server/errors';
import { endpoint } from '~/lib/server/http';
import { getBinMap } from '~/lib/server/services/bins/map';

export const GET = endpoint(({ url }, actor) => {
  const deviceType = url.searchParams.get('device_type');
  if (!deviceType) throw new AppError('bin_map_needs_type');
  return getBinMap({ actor, deviceType });
});

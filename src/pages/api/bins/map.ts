import { AppError } from '~/lib/server/errors';
import { endpoint } from '~/lib/server/http';
import { getBinMap } from '~/lib/server/services/bins/map';

export const GET = endpoint(({ url }, actor) => {
  const deviceType = url.searchParams.get('device_type');
  if (!deviceType) throw new AppError('invalid_input', 'Give ?device_type=<id or name>.');
  return getBinMap({ actor, deviceType });
});

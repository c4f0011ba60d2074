import { endpoint } from '~/lib/server/http';
import { getPartOperatingPoint } from '~/lib/server/services/parts/operating-point';

export const GET = endpoint(({ params, url }, actor) =>
  getPartOperatingPoint({ actor, serial: params.serial ?? '', query: Object.fromEntries(url.searchParams) }),
);

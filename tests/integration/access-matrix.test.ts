/**
 * The access matrix (issue 12, hostile requests): every route file under src/pages × every
 * identity (anonymous, each role, a test station), the expected answer derived from the
 * route rules of src/lib/access.ts. A new route without a rule, or a service that refuses what
 * its rule lets through (or the reverse), fails here.
 *
 * Paths use `0` for every id (no row has it), and writes send `{}`: an allowed caller gets a
 * 4xx of the request's own (400/404/409/405…) and nothing is changed.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { ROLES, STATION_GRANTS, allows, permissionsOf, ruleFor, type Permission, type Role } from '~/lib/access';
import { BASE_URL, signIn, type Session } from '../helpers/http';
import { routeFiles } from '../helpers/route-files';

type Identity = 'anonymous' | Role | 'station';
const IDENTITIES: Identity[] = ['anonymous', ...ROLES, 'station'];

const sessions = {} as Record<Role, Session>;
let stationToken = '';
beforeAll(async () => {
  for (const role of ROLES) sessions[role] = await signIn(`${role}@demo.sluice.test`);
  const res = await sessions.admin.fetch('/api/admin/stations', { method: 'POST', json: { name: `matrix station ${Date.now()}` } });
  expect(res.status).toBe(201);
  stationToken = (await res.json()).token;
});

function grantsOf(who: Identity): readonly Permission[] | null {
  if (who === 'anonymous') return null;
  if (who === 'station') return STATION_GRANTS;
  return permissionsOf([who]);
}

function call(who: Identity, method: string, path: string, api: boolean): Promise<Response> {
  const headers: Record<string, string> = { origin: BASE_URL };
  if (who === 'station') headers.authorization = `Bearer ${stationToken}`;
  else if (who !== 'anonymous') headers.cookie = sessions[who].cookie;
  const write = method !== 'GET' && method !== 'HEAD';
  if (write && api) headers['content-type'] = 'application/json';
  return fetch(`${BASE_URL}${path}`, { method, headers, redirect: 'manual', body: write && api ? '{}' : undefined });
}

const files = routeFiles().filter((f) => !f.route.startsWith('/api/auth/') && f.route !== '/sign-out');
const apiCases = files.filter((f) => f.isApi).flatMap((f) => f.methods.map((method) => ({ method, route: f.route, sample: f.sample })));
const pageCases = files.filter((f) => !f.isApi).map((f) => ({ route: f.route, sample: f.sample }));

describe.each(IDENTITIES)('as %s', (who) => {
  it.each(apiCases)('$method $route', async ({ method, sample }) => {
    const rule = ruleFor(sample, method);
    expect(rule, 'the route has a rule in access.ts').toBeDefined();
    const grants = grantsOf(who);
    const res = await call(who, method, sample, true);
    const body = await res.text();
    if (res.status >= 400) {
      expect(res.headers.get('content-type'), body.slice(0, 200)).toMatch(/application\/json/);
      expect(typeof JSON.parse(body).error?.code, body).toBe('string');
    }
    const need = rule!.need;
    if (need === 'public') expect(res.status, body).not.toBe(401);
    else if (grants === null) expect(res.status, body).toBe(401);
    else if (!allows(need, grants)) expect(res.status, body).toBe(403);
    else {
      expect(res.status, body).not.toBe(401);
      expect(res.status, body).not.toBe(403);
      expect(res.status, body).toBeLessThan(500);
    }
  });

  it.each(pageCases)('page $route', async ({ route, sample }) => {
    const rule = ruleFor(sample, 'GET');
    expect(rule).toBeDefined();
    const res = await call(who, 'GET', sample, false);
    await res.text();
    const need = rule!.need;
    // A station token is for the API: on pages a station is nobody.
    const grants = who === 'station' ? null : grantsOf(who);
    if (need === 'public') expect(res.status).toBeLessThan(500);
    else if (grants === null) {
      expect(res.status).toBe(302);
      expect(res.headers.get('location')).toMatch(/^\/sign-in\?next=/);
    } else if (!allows(need, grants)) expect(res.status).toBe(403);
    else {
      // The "not for your role" page itself answers 403 by design.
      expect(route === '/not-for-your-role' ? [403] : [200, 302, 400, 404]).toContain(res.status);
    }
  });
});

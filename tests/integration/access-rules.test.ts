import { describe, expect, it, beforeAll } from 'vitest';
import { anonymous, signIn, type Session } from '../helpers/http';

const ROLE_ACCOUNTS = {
  admin: 'admin@demo.sluice.test',
  inspector: 'inspector@demo.sluice.test',
  designer: 'designer@demo.sluice.test',
  stores: 'stores@demo.sluice.test',
} as const;
type RoleName = keyof typeof ROLE_ACCOUNTS;

/** Each row: a route, and which roles it must let through (everyone else gets 403). */
const API_RULES: { method: string; path: string; allowed: RoleName[] }[] = [
  { method: 'GET', path: '/api/admin/users', allowed: ['admin'] },
  { method: 'GET', path: '/api/me', allowed: ['admin', 'inspector', 'designer', 'stores'] },
];

const PAGE_RULES: { path: string; allowed: RoleName[] }[] = [
  { path: '/admin/users', allowed: ['admin'] },
  { path: '/dev/mail', allowed: ['admin'] },
];

const sessions = {} as Record<RoleName, Session>;
beforeAll(async () => {
  for (const [role, email] of Object.entries(ROLE_ACCOUNTS)) sessions[role as RoleName] = await signIn(email);
});

describe('anonymous requests', () => {
  it('get 401 JSON from the API', async () => {
    const res = await anonymous('/api/admin/users');
    expect(res.status).toBe(401);
    expect(res.headers.get('content-type')).toContain('application/json');
    expect((await res.json()).error.code).toBe('unauthenticated');
  });
  it('are sent to sign-in from pages, keeping where they were going', async () => {
    const res = await anonymous('/admin/users', { redirect: 'manual' });
    expect(res.status).toBe(302);
    expect(res.headers.get('location')).toBe('/sign-in?next=%2Fadmin%2Fusers');
  });
  it('can read the landing page', async () => {
    const res = await anonymous('/');
    expect(res.status).toBe(200);
    expect(await res.text()).toContain('matched pairs');
  });
});

describe.each(Object.keys(ROLE_ACCOUNTS) as RoleName[])('role %s', (role) => {
  it.each(API_RULES)('API $method $path', async ({ method, path, allowed }) => {
    const res = await sessions[role].fetch(path, { method });
    if (allowed.includes(role)) expect(res.status).toBe(200);
    else {
      expect(res.status).toBe(403);
      expect((await res.json()).error.code).toBe('forbidden');
    }
  });
  it.each(PAGE_RULES)('page $path', async ({ path, allowed }) => {
    const res = await sessions[role].fetch(path, { redirect: 'manual' });
    const html = await res.text();
    if (allowed.includes(role)) expect(res.status).toBe(200);
    else {
      expect(res.status).toBe(403);
      expect(html).toContain('not for your role');
    }
  });
});

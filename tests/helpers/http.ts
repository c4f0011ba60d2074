/** HTTP helpers for integration tests against the server `npm test` started. */
export const BASE_URL = process.env.SLUICE_TEST_BASE_URL ?? 'http://127.0.0.1:4399';
export const DEMO_PASSWORD = process.env.SLUICE_DEMO_PASSWORD ?? 'weir-street-demo';

export interface Session {
  cookie: string;
  fetch: (path: string, init?: RequestInit & { json?: unknown }) => Promise<Response>;
}

/** Signs in through better-auth's endpoint and returns a fetch that carries the session cookie. */
export async function signIn(email: string, password = DEMO_PASSWORD): Promise<Session> {
  const res = await fetch(`${BASE_URL}/api/auth/sign-in/email`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: BASE_URL },
    body: JSON.stringify({ email, password }),
  });
  if (!res.ok) throw new Error(`sign-in of ${email} failed: ${res.status} ${await res.text()}`);
  const cookie = res.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
  return {
    cookie,
    fetch: (path, init = {}) => {
      const { json, ...rest } = init;
      return fetch(`${BASE_URL}${path}`, {
        ...rest,
        headers: {
          cookie,
          origin: BASE_URL,
          ...(json !== undefined ? { 'content-type': 'application/json' } : {}),
          ...rest.headers,
        },
        body: json !== undefined ? JSON.stringify(json) : rest.body,
      });
    },
  };
}

export function anonymous(path: string, init: RequestInit = {}): Promise<Response> {
  return fetch(`${BASE_URL}${path}`, { ...init, headers: { origin: BASE_URL, ...init.headers } });
}

import http from 'node:http';
import { describe, expect, it } from 'vitest';
import { BASE_URL } from '../helpers/http';

/** Posts a sign-in from another loopback address, so this test has its own rate-limit bucket. */
function signInFrom(localAddress: string): Promise<number> {
  const url = new URL('/api/auth/sign-in/email', BASE_URL);
  const body = JSON.stringify({ email: 'nobody@demo.sluice.test', password: 'wrong-password-x' });
  return new Promise((resolve, reject) => {
    const req = http.request(
      { host: url.hostname, port: url.port, path: url.pathname, method: 'POST', localAddress, headers: { 'content-type': 'application/json', origin: BASE_URL, 'content-length': Buffer.byteLength(body) } },
      (res) => {
        res.resume();
        res.on('end', () => resolve(res.statusCode ?? 0));
      },
    );
    req.on('error', reject);
    req.end(body);
  });
}

describe('sign-in rate limit', () => {
  it('answers 429 once one address exceeds the per-minute limit', async () => {
    const limit = Number(process.env.SLUICE_SIGN_IN_LIMIT_PER_MINUTE);
    const address = `127.0.0.${10 + Math.floor(Math.random() * 200)}`;
    const statuses: number[] = [];
    for (let i = 0; i <= limit; i++) statuses.push(await signInFrom(address));
    expect(statuses.slice(0, limit).every((s) => s === 401)).toBe(true);
    expect(statuses[limit]).toBe(429);
    // A different address is not affected.
    expect(await signInFrom('127.0.0.250')).toBe(401);
  });
});

import { describe, expect, it } from 'vitest';
import { clientAddressOf, compileTrust, isCrossSiteWrite, peerIsTrusted } from '~/http-front/client-address.mjs';

const req = (remoteAddress: string, headers: Record<string, string> = {}, method = 'GET') => ({ socket: { remoteAddress }, headers, method });

// X-Forwarded-For semantics as proxies append them (RFC 7239 §5.2 describes the same chain for
// Forwarded): the right-most entries were added by the proxies nearest the server.
describe('the client address the app sees', () => {
  it('is the socket peer when no proxy is trusted, whatever X-Forwarded-For says', () => {
    expect(clientAddressOf(req('127.0.0.9', { 'x-forwarded-for': '203.0.113.5' }), compileTrust(undefined))).toBe('127.0.0.9');
    expect(compileTrust('')).toBeNull();
  });
  it('is the forwarded address when the peer is a trusted proxy', () => {
    const trust = compileTrust('127.0.0.1');
    expect(clientAddressOf(req('127.0.0.1', { 'x-forwarded-for': '203.0.113.5' }), trust)).toBe('203.0.113.5');
    expect(peerIsTrusted(req('127.0.0.1'), trust)).toBe(true);
  });
  it('ignores what a client wrote in front of the trusted proxy’s entry', () => {
    const trust = compileTrust('10.0.0.0/8, 127.0.0.1');
    // The client forged 198.51.100.1; the edge proxy (10.0.0.2) appended the real 203.0.113.5.
    const r = req('127.0.0.1', { 'x-forwarded-for': '198.51.100.1, 203.0.113.5, 10.0.0.2' });
    expect(clientAddressOf(r, trust)).toBe('203.0.113.5');
  });
  it('does not believe an untrusted peer', () => {
    const trust = compileTrust('10.0.0.0/8');
    expect(clientAddressOf(req('192.0.2.7', { 'x-forwarded-for': '203.0.113.5' }), trust)).toBe('192.0.2.7');
    expect(peerIsTrusted(req('192.0.2.7'), trust)).toBe(false);
  });
  it('refuses a setting that is not an address or range, naming it', () => {
    expect(() => compileTrust('10.0.0.0/8, not-an-address')).toThrow(/SLUICE_TRUSTED_PROXIES/);
  });
});

// Astro 5's origin check (astro/dist/core/app/middlewares.js): a write with a form-like or no
// content type must come with Origin equal to the server's own.
describe('cross-site writes refused as JSON for the API', () => {
  const own = { host: '127.0.0.1:4321' };
  it.each([
    ['DELETE', {}, true],
    ['POST', { 'content-type': 'multipart/form-data; boundary=x' }, true],
    ['POST', { 'content-type': 'application/x-www-form-urlencoded', origin: 'http://evil.test' }, true],
    ['POST', { 'content-type': 'text/plain' }, true],
    ['POST', { 'content-type': 'application/json' }, false],
    ['DELETE', { origin: 'http://127.0.0.1:4321' }, false],
    ['GET', {}, false],
  ] as const)('%s %j → refused: %s', (method, headers, refused) => {
    expect(isCrossSiteWrite(req('127.0.0.1', { ...own, ...headers }, method), 'http')).toBe(refused);
  });
});

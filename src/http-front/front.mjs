// The built app's process entry (copied to <build>/server/entry.mjs by ./integration.mjs; the
// Astro node adapter's own entry is app.mjs beside it). It owns the HTTP server so that:
//
// - the client address Astro hands the app (`clientAddress`, which the rate limits and the
//   session records use) is the socket's peer, or, only when that peer is a proxy listed in
//   SLUICE_TRUSTED_PROXIES, the address that proxy put in X-Forwarded-For. The adapter alone
//   would believe any client's X-Forwarded-For;
// - API calls that Astro's cross-site check would refuse with a text/plain 403 get the same
//   refusal as the API's JSON error. Astro's check stays on behind this one, for pages.
import http from 'node:http';
import { clientAddressOf, compileTrust, isCrossSiteWrite, peerIsTrusted } from './client-address.mjs';

process.env.ASTRO_NODE_AUTOSTART = 'disabled';
const { handler } = await import('./app.mjs');

let trust;
try {
  trust = compileTrust(process.env.SLUICE_TRUSTED_PROXIES);
} catch (err) {
  console.error(err.message);
  process.exit(1);
}

function refuseCrossSite(req, res, protocol) {
  const own = `${protocol}://${req.headers.host ?? 'this server'}`;
  const body = JSON.stringify({
    error: {
      code: 'forbidden',
      message:
        `A ${req.method} ${req.headers['content-type'] ? 'form or multipart post' : 'without a body'} must carry the header Origin: ${own} ` +
        '(browsers send it; scripts and test stations add it). JSON requests (Content-Type: application/json) need no Origin.',
    },
  });
  res.writeHead(403, { 'content-type': 'application/json; charset=utf-8', 'content-length': Buffer.byteLength(body) });
  res.end(body);
}

function onRequest(req, res) {
  const peerTrusted = peerIsTrusted(req, trust);
  const client = clientAddressOf(req, trust);
  // Astro reads its client address from the first X-Forwarded-For value: leave it only the
  // address worked out here. The forwarded host and protocol count only from a trusted proxy.
  req.headers['x-forwarded-for'] = client;
  if (!peerTrusted) {
    delete req.headers['x-forwarded-host'];
    delete req.headers['x-forwarded-proto'];
    delete req.headers['x-forwarded-port'];
  }
  const forwardedProto = peerTrusted ? String(req.headers['x-forwarded-proto'] ?? '').split(',')[0].trim() : '';
  const protocol = forwardedProto || (req.socket.encrypted ? 'https' : 'http');
  if ((req.url ?? '').startsWith('/api/') && isCrossSiteWrite(req, protocol)) return refuseCrossSite(req, res, protocol);
  handler(req, res);
}

const host = process.env.HOST ?? '127.0.0.1';
const port = Number(process.env.PORT ?? 4321);
const server = http.createServer(onRequest);
server.listen(port, host, () => {
  console.log(`[web] listening on http://${host}:${port}${trust ? ` (trusted proxies: ${process.env.SLUICE_TRUSTED_PROXIES})` : ''}`);
});

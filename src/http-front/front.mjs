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
import proxyaddr from 'proxy-addr';

process.env.ASTRO_NODE_AUTOSTART = 'disabled';
const { handler } = await import('./app.mjs');

/**
 * SLUICE_TRUSTED_PROXIES: comma-separated addresses or CIDR ranges (e.g. `127.0.0.1,10.0.0.0/8`)
 * or proxy-addr's names `loopback`, `linklocal`, `uniquelocal`. Unset: no proxy is trusted.
 */
function trustFromEnv(raw) {
  const list = (raw ?? '').split(',').map((s) => s.trim()).filter(Boolean);
  if (!list.length) return null;
  try {
    return proxyaddr.compile(list);
  } catch (err) {
    console.error(`SLUICE_TRUSTED_PROXIES is not valid (${err.message}). Give addresses or CIDR ranges separated by commas, e.g. 127.0.0.1,10.0.0.0/8.`);
    process.exit(1);
  }
}
const trust = trustFromEnv(process.env.SLUICE_TRUSTED_PROXIES);

const FORM_TYPES = ['application/x-www-form-urlencoded', 'multipart/form-data', 'text/plain'];
const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/** Astro's cross-site rule: a bodiless or form-like write must carry this server's own Origin. */
function crossSite(req, protocol) {
  if (SAFE_METHODS.has(req.method ?? 'GET')) return false;
  const type = req.headers['content-type'];
  if (type && !FORM_TYPES.some((t) => type.toLowerCase().includes(t))) return false;
  return req.headers.origin !== `${protocol}://${req.headers.host ?? ''}`;
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
  const peerTrusted = trust !== null && trust(req.socket.remoteAddress ?? '', 0);
  const client = trust ? proxyaddr(req, trust) : req.socket.remoteAddress;
  // Astro reads its client address from the first X-Forwarded-For value: leave it only the
  // address worked out here. The forwarded host and protocol count only from a trusted proxy.
  req.headers['x-forwarded-for'] = client ?? '';
  if (!peerTrusted) {
    delete req.headers['x-forwarded-host'];
    delete req.headers['x-forwarded-proto'];
    delete req.headers['x-forwarded-port'];
  }
  const forwardedProto = peerTrusted ? String(req.headers['x-forwarded-proto'] ?? '').split(',')[0].trim() : '';
  const protocol = forwardedProto || (req.socket.encrypted ? 'https' : 'http');
  if ((req.url ?? '').startsWith('/api/') && crossSite(req, protocol)) return refuseCrossSite(req, res, protocol);
  handler(req, res);
}

const host = process.env.HOST ?? '127.0.0.1';
const port = Number(process.env.PORT ?? 4321);
const server = http.createServer(onRequest);
server.listen(port, host, () => {
  console.log(`[web] listening on http://${host}:${port}${trust ? ` (trusted proxies: ${process.env.SLUICE_TRUSTED_PROXIES})` : ''}`);
});

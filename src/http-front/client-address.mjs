// Pure helpers of the HTTP front (front.mjs), kept apart so that tests can call them.
import proxyaddr from 'proxy-addr';

/**
 * SLUICE_TRUSTED_PROXIES: comma-separated addresses or CIDR ranges (e.g. `127.0.0.1,10.0.0.0/8`)
 * or proxy-addr's names `loopback`, `linklocal`, `uniquelocal`. Empty: null (no proxy trusted).
 * Throws with a message naming the setting when an entry is not an address or range.
 */
export function compileTrust(raw) {
  const list = String(raw ?? '').split(',').map((s) => s.trim()).filter(Boolean);
  if (!list.length) return null;
  try {
    return proxyaddr.compile(list);
  } catch (err) {
    throw new Error(`SLUICE_TRUSTED_PROXIES is not valid (${err.message}). Give addresses or CIDR ranges separated by commas, e.g. 127.0.0.1,10.0.0.0/8.`);
  }
}

/**
 * The client's address: the socket's peer, or, when the peer is a trusted proxy, the nearest
 * address in X-Forwarded-For that is not itself a trusted proxy. `req` needs `socket.remoteAddress`
 * and `headers`.
 */
export function clientAddressOf(req, trust) {
  if (!trust) return req.socket.remoteAddress ?? '';
  return proxyaddr(req, trust) ?? '';
}

/** Whether the socket's peer is a trusted proxy (so its X-Forwarded-Host/Proto count). */
export function peerIsTrusted(req, trust) {
  return trust !== null && trust(req.socket.remoteAddress ?? '', 0);
}

const FORM_TYPES = ['application/x-www-form-urlencoded', 'multipart/form-data', 'text/plain'];
const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/** Astro's cross-site rule: a bodiless or form-like write must carry this server's own Origin. */
export function isCrossSiteWrite(req, protocol) {
  if (SAFE_METHODS.has(req.method ?? 'GET')) return false;
  const type = req.headers['content-type'];
  if (type && !FORM_TYPES.some((t) => type.toLowerCase().includes(t))) return false;
  return req.headers.origin !== `${protocol}://${req.headers.host ?? ''}`;
}

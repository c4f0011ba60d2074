/**
 * Where to send someone after sign-in: only a path on this site. Shared by the sign-in page
 * (server redirect) and the sign-in form (browser redirect).
 *
 * Accepted: one leading `/` followed by a path character, e.g. `/parts?bin=A`. Refused
 * (→ `fallback`): anything with a scheme (`https:`, `javascript:`), a protocol-relative
 * `//host`, a `/\host` (browsers read `\` as `/`), control characters (browsers drop tabs and
 * newlines inside URLs, so `/\t/host` is `//host`), and the same tricks percent-encoded
 * once or twice (`/%5Chost`, `/%2F%2Fhost`, `%252F`).
 */
export function safeNextPath(raw: string | null | undefined, fallback = '/home'): string {
  if (!raw || raw.length > 2000) return fallback;
  let probe = raw;
  // Decode up to three times, so that doubly encoded slashes and backslashes are seen too.
  for (let i = 0; i < 3; i++) {
    if (!isPlainPath(probe)) return fallback;
    let decoded: string;
    try {
      decoded = decodeURIComponent(probe);
    } catch {
      return fallback;
    }
    if (decoded === probe) break;
    probe = decoded;
  }
  if (!isPlainPath(probe)) return fallback;
  // The URL parser is the last word: the path must stay on a made-up origin.
  try {
    const base = 'http://sluice.invalid';
    const resolved = new URL(raw, base);
    if (resolved.origin !== base) return fallback;
  } catch {
    return fallback;
  }
  return raw;
}

function isPlainPath(s: string): boolean {
  if (!s.startsWith('/')) return false;
  if (s.length > 1 && (s[1] === '/' || s[1] === '\\')) return false;
  // Control characters and backslashes anywhere.
  return !/[\u0000-\u001f\u007f\\]/.test(s);
}

/** URLSearchParams → plain object for zod (empty strings count as absent). */
export function queryObject(params: URLSearchParams): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of params) if (v !== '') out[k] = v;
  return out;
}

/** Turns URLSearchParams into a plain object for a zod query schema. */
export function searchParamsObject(params: URLSearchParams): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of params) out[k] = v;
  return out;
}

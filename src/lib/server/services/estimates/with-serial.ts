/** Puts the serial from the URL into a request body (the body's own serial, if any, is replaced). */
export function withSerial(body: unknown, serial: string | undefined): unknown {
  const base = body && typeof body === 'object' && !Array.isArray(body) ? (body as Record<string, unknown>) : {};
  return { ...base, serial };
}

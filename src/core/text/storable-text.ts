/** Longest failure text kept in the database or in a job's output, in UTF-16 code units. */
export const MAX_STORED_TEXT = 2000;

/**
 * Text PostgreSQL can store in a `text` or `jsonb` value: NUL characters (which neither type
 * accepts) become "␀" (U+2400), unpaired UTF-16 surrogates (which have no UTF-8 encoding)
 * become U+FFFD, and text longer than `maxLength` is cut, ending with "…". Never throws; any
 * value that is not a string is turned into one first.
 */
export function storableText(value: unknown, maxLength = MAX_STORED_TEXT): string {
  const text = typeof value === 'string' ? value : safeString(value);
  let out = text.replace(/\u0000/g, '\u2400').replace(/[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g, '\uFFFD');
  if (out.length > maxLength) {
    let cut = Math.max(0, maxLength - 1);
    // Never split a surrogate pair at the cut.
    if (cut > 0 && /[\uD800-\uDBFF]/.test(out[cut - 1])) cut -= 1;
    out = `${out.slice(0, cut)}…`;
  }
  return out;
}

/** The message of an error (or the string form of any thrown value), made storable. */
export function storableErrorMessage(error: unknown, maxLength = MAX_STORED_TEXT): string {
  if (error instanceof Error) return storableText(error.message, maxLength);
  return storableText(error, maxLength);
}

function safeString(value: unknown): string {
  try {
    return String(value);
  } catch {
    return Object.prototype.toString.call(value);
  }
}

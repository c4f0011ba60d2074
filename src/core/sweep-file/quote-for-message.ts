/** Longest refusal message, in UTF-16 code units. */
export const MAX_MESSAGE_LENGTH = 1000;

/** Longest piece of the file's own text (a cell, a header, a value) quoted in a message. */
export const MAX_QUOTED_LENGTH = 40;

// C0 and C1 controls, DEL, line and paragraph separators, bidirectional overrides and
// isolates, zero-width characters and unpaired surrogates: none may reach a message raw.
// eslint-disable-next-line no-control-regex
const UNSAFE = /[\u0000-\u001f\u007f-\u009f\u00ad\u061c\u180e\u200b-\u200f\u2028-\u202e\u2060-\u2069\ufeff\ufff9-\ufffb]|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/g;

/**
 * Text from an uploaded file made safe to show: every control or invisible formatting
 * character written as `\uXXXX` (tab as `\t`, and so on), so that a message never carries a
 * NUL, a line break or a bidirectional override raw.
 */
export function escapeForMessage(text: string): string {
  return text.replace(UNSAFE, (c) => {
    if (c === '\t') return '\\t';
    if (c === '\n') return '\\n';
    if (c === '\r') return '\\r';
    return `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`;
  });
}

/** `text` escaped and cut to `max` characters, ending in "..." when cut. */
export function quoteForMessage(text: string, max = MAX_QUOTED_LENGTH): string {
  const cut = text.length > max ? `${text.slice(0, Math.max(0, max - 3))}...` : text;
  return capLength(escapeForMessage(cut), max + 3 * 6);
}

/** Cuts `text` to `max` code units, ending in "...", never inside a surrogate pair. */
export function capLength(text: string, max: number): string {
  if (text.length <= max) return text;
  let end = Math.max(0, max - 3);
  const code = text.charCodeAt(end - 1);
  if (code >= 0xd800 && code <= 0xdbff) end--;
  return `${text.slice(0, end)}...`;
}

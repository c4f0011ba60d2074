/**
 * A field path as people read it: `['axes', 0, 'edges', 'width']` → "axis 1, edges, width".
 * Used wherever a validation message names the field it is about, so nobody is shown a
 * machine path such as `axes.0.edges.width`. Pure; safe in the browser.
 */
const WORDS: Record<string, string> = {
  idss: 'IDSS',
  vds: 'VDS',
  vgs: 'VGS',
  vp: 'VP',
  vto: 'VTO',
  gfs: 'gfs',
  gos: 'gos',
  rds: 'rDS',
  id: 'ID',
  vgs0: 'VGS0',
  lo: 'LO',
  rf: 'RF',
  dvgs: 'VGS difference',
  startvalue: 'start value',
  referencecurrenta: 'reference current',
};

/** Units that end field names (`idss_a`, `vdsTestV`): the message already speaks of the quantity. */
const UNIT_SUFFIXES = new Set(['a', 'v', 's', 'ohm', 'c', 'mm', 'pct', 'hz']);

function singular(word: string): string {
  if (word === 'axes') return 'axis';
  if (/ies$/.test(word)) return word.slice(0, -3) + 'y';
  if (/(ss|x|ch|sh)es$/.test(word)) return word.slice(0, -2);
  if (/[^s]s$/.test(word)) return word.slice(0, -1);
  return word;
}

function nameWords(name: string): string {
  const whole = WORDS[name.toLowerCase().replace(/[_\s-]/g, '')];
  if (whole) return whole;
  const parts = name
    .replace(/([a-z0-9])([A-Z])/g, '$1_$2')
    .split(/[_\s-]+/)
    .filter(Boolean)
    .map((p) => p.toLowerCase());
  if (parts.length > 1 && UNIT_SUFFIXES.has(parts[parts.length - 1]!)) parts.pop();
  return parts.map((p) => WORDS[p] ?? p).join(' ');
}

/** The path in words, outermost first; list positions count from 1 and name their item. */
export function fieldPathWords(path: readonly PropertyKey[]): string {
  const out: string[] = [];
  for (const seg of path) {
    if (typeof seg === 'number' || (typeof seg === 'string' && /^\d+$/.test(seg))) {
      const n = Number(seg) + 1;
      const prev = out.pop();
      out.push(prev ? `${singular(prev)} ${n}` : `item ${n}`);
    } else {
      out.push(nameWords(String(seg)));
    }
  }
  return out.join(', ');
}

/**
 * "where: what" for one validation issue, without saying the field twice when the message
 * already starts with the field's own name ("width must be greater than 0").
 */
export function describeIssue(path: readonly PropertyKey[], message: string): string {
  if (path.length === 0) return message;
  const words = fieldPathWords(path);
  const last = typeof path[path.length - 1] === 'number' ? null : nameWords(String(path[path.length - 1]));
  if (last && message.toLowerCase().startsWith(last.toLowerCase()) && path.length > 1) {
    return `${fieldPathWords(path.slice(0, -1))}: ${message}`;
  }
  if (last && message.toLowerCase().startsWith(String(path[path.length - 1]).toLowerCase()) && path.length > 1) {
    return `${fieldPathWords(path.slice(0, -1))}: ${nameWords(String(path[path.length - 1]))}${message.slice(String(path[path.length - 1]).length)}`;
  }
  return `${words}: ${message}`;
}

export type SweepDelimiter = ',' | ';' | '\t';

const QUOTE = 34;

/**
 * Picks the delimiter from the header line: tab if it has one outside quotes, else
 * semicolon, else comma. A header with none of them is one cell; `undefined` then.
 */
export function detectDelimiter(headerLine: string): SweepDelimiter | undefined {
  let tabs = 0;
  let semicolons = 0;
  let commas = 0;
  let quoted = false;
  for (let i = 0; i < headerLine.length; i++) {
    const c = headerLine[i];
    if (c === '"') quoted = !quoted;
    else if (quoted) continue;
    else if (c === '\t') tabs++;
    else if (c === ';') semicolons++;
    else if (c === ',') commas++;
  }
  if (tabs > 0) return '\t';
  if (semicolons > 0) return ';';
  if (commas > 0) return ',';
  return undefined;
}

/**
 * Splits one line into cells. A cell that starts with `"` (after blanks) runs to the
 * matching `"`, with `""` standing for one quote, as in RFC 4180; text after the closing
 * quote is kept. Quoted cells cannot span lines. An unclosed quote runs to the end of the
 * line. Cells are returned untrimmed except for quoted ones, which lose their quotes.
 */
export function splitDelimitedLine(line: string, delimiter: SweepDelimiter | undefined): string[] {
  if (delimiter === undefined) return [unquote(line)];
  if (line.indexOf('"') < 0) return line.split(delimiter);
  const cells: string[] = [];
  const delimiterCode = delimiter.charCodeAt(0);
  let i = 0;
  const n = line.length;
  for (;;) {
    let start = i;
    while (start < n && (line[start] === ' ' || (line[start] === '\t' && delimiter !== '\t'))) start++;
    if (start < n && line.charCodeAt(start) === QUOTE) {
      let cell = '';
      let j = start + 1;
      for (;;) {
        const close = line.indexOf('"', j);
        if (close < 0) {
          cell += line.slice(j);
          j = n;
          break;
        }
        cell += line.slice(j, close);
        if (line.charCodeAt(close + 1) === QUOTE) {
          cell += '"';
          j = close + 2;
        } else {
          j = close + 1;
          break;
        }
      }
      let end = j;
      while (end < n && line.charCodeAt(end) !== delimiterCode) end++;
      cells.push(cell + line.slice(j, end));
      if (end >= n) return cells;
      i = end + 1;
    } else {
      const end = line.indexOf(delimiter, i);
      if (end < 0) {
        cells.push(line.slice(i));
        return cells;
      }
      cells.push(line.slice(i, end));
      i = end + 1;
    }
  }
}

function unquote(cell: string): string {
  const t = cell.trim();
  if (t.length >= 2 && t.startsWith('"') && t.endsWith('"')) return t.slice(1, -1).replaceAll('""', '"');
  return cell;
}

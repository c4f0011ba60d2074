import { describe, expect, it } from 'vitest';
import { storableErrorMessage, storableText } from '~/core/text/storable-text';

// PostgreSQL's text and jsonb types refuse U+0000 ("invalid byte sequence for encoding UTF8:
// 0x00", "unsupported Unicode escape sequence"), and a lone UTF-16 surrogate has no UTF-8
// form (Unicode Standard, ch. 3, D91): the PostgreSQL documentation, "Character Types".
describe('storableText', () => {
  it('replaces NUL with U+2400 and keeps the rest', () => {
    expect(storableText('a\u0000b\u0000')).toBe('a\u2400b\u2400');
  });

  it('replaces unpaired surrogates with U+FFFD and keeps valid pairs', () => {
    expect(storableText('x\uD800y\uDC00z')).toBe('x\uFFFDy\uFFFDz');
    expect(storableText('ok \uD83D\uDE00')).toBe('ok \uD83D\uDE00');
    expect(storableText('\uDE00\uD83D')).toBe('\uFFFD\uFFFD');
  });

  it('cuts long text with an ellipsis, never inside a surrogate pair', () => {
    expect(storableText('abcdef', 4)).toBe('abc…');
    expect(storableText('abcdef', 6)).toBe('abcdef');
    const cut = storableText('ab\uD83D\uDE00cd', 4);
    expect(cut).toBe('ab…');
    expect(Buffer.from(cut, 'utf8').toString('utf8')).toBe(cut);
  });

  it('turns other values into text, even ones whose toString throws', () => {
    expect(storableText(42)).toBe('42');
    const hostile = { toString: () => { throw new Error('no'); } };
    expect(storableText(hostile)).toBe('[object Object]');
  });

  it('gives the message of an error, made storable', () => {
    expect(storableErrorMessage(new Error('bad\u0000file'))).toBe('bad\u2400file');
    expect(storableErrorMessage('plain')).toBe('plain');
  });

  it('the result survives a JSON round trip as PostgreSQL jsonb would take it (no \\u0000 escape)', () => {
    const json = JSON.stringify({ message: storableText('\u0000\uD800'.repeat(3)) });
    expect(json).not.toContain('\\u0000');
    expect(json).not.toMatch(/\\ud8/i);
  });
});

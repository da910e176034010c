// Splits one line of a design file into tokens with their exact columns. The language is line-based: a
// statement never spans lines, so an error on one line can never swallow the next.
import type { SourcePosition, SourceRange } from './source';

export type TokenKind = 'ident' | 'number' | 'badNumber' | 'op' | 'unknown';

export interface Token {
  readonly kind: TokenKind;
  readonly text: string;
  readonly line: number;
  /** UTF-16 column of the first character. */
  readonly start: number;
  /** UTF-16 column just past the last character. */
  readonly end: number;
  /** The same extent as a range; made once, since most tokens end up in some origin or diagnostic. */
  readonly range: SourceRange;
}

export interface LexedLine {
  readonly line: number;
  readonly tokens: readonly Token[];
  /** Column where a `#` comment starts, if any. */
  readonly commentStart?: number;
}

// Identifiers may hold the micro and ohm signs so that `µF` and `kΩ` read as one word.
const isLetter = (c: number): boolean =>
  (c >= 65 && c <= 90) ||
  (c >= 97 && c <= 122) ||
  c === 95 ||
  c === 0xb5 ||
  c === 0x3bc ||
  c === 0x3a9 ||
  c === 0x2126;
const isDigitCode = (c: number): boolean => c >= 48 && c <= 57;
const IDENT_START = { test: (ch: string): boolean => isLetter(ch.charCodeAt(0)) };
const IDENT_PART = {
  test: (ch: string): boolean => isLetter(ch.charCodeAt(0)) || isDigitCode(ch.charCodeAt(0)),
};
const DIGIT = { test: (ch: string): boolean => ch.length > 0 && isDigitCode(ch.charCodeAt(0)) };
const NUMBER = /(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][+-]?[0-9]+)?/y;
const TWO_CHAR_OPS = new Set(['->', '>=', '<=', '||', '..']);
const ONE_CHAR_OPS = new Set(['=', ',', '+', '-', '*', '/', '^', '(', ')', '.', '%', '>', '<', '\u00b0']);

export function lexLine(text: string, line: number): LexedLine {
  const tokens: Token[] = [];
  let i = 0;
  const push = (kind: TokenKind, from: number, to: number, spelled?: string): void => {
    tokens.push({
      kind,
      text: spelled ?? text.slice(from, to),
      line,
      start: from,
      end: to,
      range: { start: { line, character: from }, end: { line, character: to } },
    });
  };
  while (i < text.length) {
    const c = text[i]!;
    if (c === '#') return { line, tokens, commentStart: i };
    if (c === ' ' || c === '\t' || c === '\u00a0' || c === '\r' || c === '\f' || c === '\v') {
      i++;
      continue;
    }
    if (DIGIT.test(c) || (c === '.' && DIGIT.test(text[i + 1] ?? ''))) {
      NUMBER.lastIndex = i;
      const m = NUMBER.exec(text)!;
      let end = i + m[0].length;
      const next = text[end] ?? '';
      // `1.2.3`, `5e` or `5e+` are malformed numbers, not a number followed by something else (no unit
      // starts with `e`, so this never steals a unit).
      if (next === '.' || DIGIT.test(next) || next === 'e' || next === 'E') {
        while (end < text.length && /[0-9A-Za-z_.+-]/.test(text[end]!)) {
          if ((text[end] === '+' || text[end] === '-') && !/[eE]/.test(text[end - 1]!)) break;
          end++;
        }
        push('badNumber', i, end);
      } else {
        push('number', i, end);
      }
      i = end;
      continue;
    }
    if (IDENT_START.test(c)) {
      let end = i + 1;
      while (end < text.length && IDENT_PART.test(text[end]!)) end++;
      push('ident', i, end);
      i = end;
      continue;
    }
    const two = text.slice(i, i + 2);
    if (TWO_CHAR_OPS.has(two)) {
      push('op', i, i + 2);
      i += 2;
      continue;
    }
    if (c === '\u2265' || c === '\u2264') {
      push('op', i, i + 1, c === '\u2265' ? '>=' : '<=');
      i++;
      continue;
    }
    if (c === '\u2212') {
      // The typographic minus sign reads as `-`.
      push('op', i, i + 1, '-');
      i++;
      continue;
    }
    if (c === '\u2225') {
      // The parallel sign reads as `||`.
      push('op', i, i + 1, '||');
      i++;
      continue;
    }
    if (c === '\u00d7' || c === '\u00b7') {
      push('op', i, i + 1, '*');
      i++;
      continue;
    }
    if (ONE_CHAR_OPS.has(c)) {
      push('op', i, i + 1);
      i++;
      continue;
    }
    // One unknown character per token, counting a surrogate pair as one character.
    const code = text.codePointAt(i)!;
    const width = code > 0xffff ? 2 : 1;
    push('unknown', i, i + width);
    i += width;
  }
  return { line, tokens };
}

export const tokenRange = (t: Token): SourceRange => t.range;

// Letters a unit may be typed with, and `/` and `%`: what may follow a number while its unit is typed.
const isUnitChar = (c: number): boolean =>
  (c >= 65 && c <= 90) || (c >= 97 && c <= 122) || c === 0xb5 || c === 0x3a9 || c === 0x2f || c === 0x25;

/**
 * True when `before` (a line up to the cursor) ends in a number, then optional spaces, then possibly the
 * start of a unit (`1.1 `, `1.1p`, `6 V/u`), not a name that ends in a digit (`gm1 `). Made with the lexer,
 * so it takes time linear in the line however long its number is.
 */
export function endsAfterNumber(before: string): boolean {
  let end = before.length;
  while (end > 0 && isUnitChar(before.charCodeAt(end - 1))) end--;
  while (end > 0 && /\s/.test(before[end - 1]!)) end--;
  // Lex only the last word (and the number's sign or operator before it): enough to see a number token.
  let from = end;
  while (from > 0 && !/\s/.test(before[from - 1]!)) from--;
  const tokens = lexLine(before.slice(from, end), 0).tokens;
  const last = tokens[tokens.length - 1];
  return last !== undefined && last.kind === 'number' && last.end === end - from;
}

/** The range from the start of `a` to the end of `b` (both on the same line). */
export const spanRange = (a: Token, b: Token): SourceRange =>
  a === b ? a.range : { start: a.range.start, end: b.range.end };

export const tokenEnd = (t: Token): SourcePosition => t.range.end;

// A number and its unit: `1.1 pF`, `6 V/us`, `50 uA/V^2`, `0.04 /V`, `0.04 V^-1`, `0.1 %`. The unit belongs to
// the number: a power written on a unit raises that unit only (`50 uA/V^2` is 50 µA/V², as SI writes it),
// never the number in front. Within a unit there are no spaces (`V/us`, `uA/V^2`), except that the power
// may be spaced (`V ^ 2`); a leading `/` may be apart from the number (`0.04 /V`) but not from its unit.
import { quote, quoteShort } from './diagnostics';
import { hasNonzeroDigit, representation } from './doublePrecision';
import type { Cursor, Expr, ExpressionContext } from './expression';
import { isFunctionName } from './expressionFunctions';
import { spanRange, tokenRange, type Token } from './lexer';
import {
  DIMENSIONLESS,
  divDim,
  isDimensionless,
  lookupUnit,
  powDim,
  scaleLiteral,
  unitsLike,
  type Dimension,
} from './unitTable';

/** One unit word with its optional power: `uA`, `V^2`, `%`. */
interface UnitWord {
  readonly text: string;
  readonly exp10: number;
  readonly dim: Dimension;
  readonly last: Token;
}

type Read = UnitWord | 'failed';

const adjacent = (a: Token | undefined, b: Token | undefined): boolean =>
  a !== undefined && b !== undefined && a.end === b.start;

/** Reads a number token and the unit after it (if any) as one literal. */
export function parseLiteral(c: Cursor, ctx: ExpressionContext, num: Token): Expr {
  const unit = readUnit(c, ctx, num);
  if (unit === 'failed') return { kind: 'invalid', range: spanRange(num, c.last()!) };
  const value = unit ? scaleLiteral(num.text, unit.exp10) : Number(num.text);
  const range = unit ? spanRange(num, unit.last) : tokenRange(num);
  const written = unit ? `${num.text} ${unit.text}` : num.text;
  const rep = representation(value, hasNonzeroDigit(num.text));
  if (rep !== 'ok') {
    // A double cannot hold it: the engine would compute with infinity, zero or a number stripped of its
    // precision. Refused here, so the statement is left out and the rest of the file is still analysed.
    ctx.sink.error(
      'plausibility',
      rep === 'overflow'
        ? `${quoteShort(written)} is too large to compute with (beyond about 1.8e308 in SI units): values this far beyond any circuit cannot be analysed.`
        : `${quoteShort(written)} is too small to compute with (below about 2.2e-308 in SI units): values this far beyond any circuit cannot be analysed.`,
      range,
    );
    return { kind: 'invalid', range };
  }
  return unit
    ? { kind: 'number', value, dim: unit.dim, numberText: num.text, unitText: unit.text, range }
    : { kind: 'number', value, dim: DIMENSIONLESS, numberText: num.text, range };
}

/** The unit after a number: `undefined` when there is none, `failed` after reporting a mistake in it. */
function readUnit(c: Cursor, ctx: ExpressionContext, num: Token): UnitWord | undefined | 'failed' {
  // `0.04 /V` and `0.04 1/V`: a reciprocal unit. `2 / V` (spaced) stays a division by a name.
  const one = c.peek()?.kind === 'number' && c.peek()!.text === '1' ? 1 : 0;
  const slash = c.peek(one);
  const den = c.peek(one + 1);
  if (
    slash?.kind === 'op' &&
    slash.text === '/' &&
    (!one || adjacent(c.peek(), slash)) &&
    den?.kind === 'ident' &&
    adjacent(slash, den) &&
    lookupUnit(den.text) &&
    !isDimensionless(lookupUnit(den.text)!.dim)
  ) {
    c.pos += one + 1;
    const d = readWord(c, ctx);
    if (d === 'failed' || !d) return 'failed';
    return {
      text: `${one ? '1' : ''}/${d.text}`,
      exp10: -d.exp10,
      dim: divDim(DIMENSIONLESS, d.dim),
      last: d.last,
    };
  }
  const u = c.peek();
  if (!u) return undefined;
  if (u.kind === 'ident' && !lookupUnit(u.text)) {
    // A word right after a number is its unit, unless it is the next field, a flag, or a name being
    // assigned (`gm1 = 1, load.cap = …` in a corner).
    if (ctx.stopWords.has(u.text) || c.isOp('=', 1) || c.isOp('.', 1)) return undefined;
    c.next();
    if (isFunctionName(u.text) && c.isOp('(')) {
      ctx.sink.error(
        'syntax',
        `Write ${quote(`${num.text} * ${u.text}(…)`)} to multiply by a function.`,
        tokenRange(u),
      );
      // The call's arguments belong to this mistake: skip them rather than report them again.
      for (let depth = 0; !c.atEnd();) {
        const t = c.next()!;
        if (t.kind === 'op' && t.text === '(') depth++;
        else if (t.kind === 'op' && t.text === ')' && --depth === 0) break;
      }
      return 'failed';
    }
    ctx.sink.error(
      'unit',
      `Unknown unit ${quoteShort(u.text)}.${unknownUnitHint(u.text, num.text)}`,
      tokenRange(u),
    );
    return 'failed';
  }
  const numerator = readWord(c, ctx);
  if (!numerator || numerator === 'failed') return numerator;
  // A compound unit is written without spaces: `V/us`, `A/V`, `uA/V^2`.
  const s = c.peek();
  const d = c.peek(1);
  if (!(
    s?.kind === 'op' &&
    s.text === '/' &&
    adjacent(numerator.last, s) &&
    d?.kind === 'ident' &&
    adjacent(s, d)
  ))
    return numerator;
  const denInfo = lookupUnit(d.text);
  if (!denInfo || isDimensionless(denInfo.dim)) {
    c.pos += 2;
    ctx.sink.error(
      'unit',
      `Unknown unit ${quoteShort(d.text)} in ${quoteShort(`${numerator.text}/${d.text}`)}.`,
      tokenRange(d),
    );
    return 'failed';
  }
  c.next();
  const denominator = readWord(c, ctx);
  if (!denominator || denominator === 'failed') return 'failed';
  return {
    text: `${numerator.text}/${denominator.text}`,
    exp10: numerator.exp10 - denominator.exp10,
    dim: divDim(numerator.dim, denominator.dim),
    last: denominator.last,
  };
}

/** A known unit word (`pF`, `V`, `%`, `°`) at the cursor and its optional power (`^2`, `^-1`). */
function readWord(c: Cursor, ctx: ExpressionContext): UnitWord | undefined | 'failed' {
  const t = c.peek();
  if (!t || !(t.kind === 'ident' || (t.kind === 'op' && (t.text === '%' || t.text === '\u00b0'))))
    return undefined;
  const info = lookupUnit(t.text);
  if (!info) return undefined;
  c.next();
  if (!c.isOp('^')) return { text: t.text, exp10: info.exp10, dim: info.dim, last: t };
  const caret = c.next()!;
  const sign = c.isOp('-') || c.isOp('+') ? c.next()! : undefined;
  const p = c.peek();
  if (p?.kind !== 'number') {
    ctx.sink.error(
      'unit',
      `A unit's power is a plain number right after \`^\` (\`V^2\`, \`V^-1\`); to raise a value, put it in parentheses: \`(2 V)^n\`.`,
      p ? tokenRange(p) : tokenRange(sign ?? caret),
    );
    if (p?.kind === 'badNumber') c.next();
    return 'failed';
  }
  c.next();
  const power = (sign?.text === '-' ? -1 : 1) * Number(p.text);
  // The prefix is part of the unit, so it is raised too: 1 us^2 is (1e-6 s)^2.
  return {
    text: `${t.text}^${sign?.text === '-' ? '-' : ''}${p.text}`,
    exp10: info.exp10 * power,
    dim: powDim(info.dim, power),
    last: p,
  };
}

/** `Meg`, `megohm`: in SI, `M` is mega and `m` milli; `Meg` is no prefix here. */
function megaHint(word: string, numberText: string): string | undefined {
  if (!/^meg/i.test(word)) return undefined;
  const rest = word.slice(3);
  const plain = (u: string): boolean => lookupUnit(u)?.exp10 === 0 && !isDimensionless(lookupUnit(u)!.dim);
  const unit = rest === '' ? '' : plain(rest) ? rest : unitsLike(rest).find(plain);
  if (unit === undefined) return undefined;
  return ` Did you mean ${quote(`${numberText} M${unit}`)}? Prefixes are SI: \`M\` is mega (1e6), \`m\` is milli (1e-3).`;
}

function unknownUnitHint(word: string, numberText: string): string {
  if (word === 'ugf') return ` Write ${quote(`${numberText} * ugf`)}.`;
  const mega = megaHint(word, numberText);
  if (mega) return mega;
  const like = unitsLike(word);
  if (like.length) return ` Did you mean ${like.map(quote).join(' or ')}?`;
  if (lookupUnit(word.slice(1))) return ` ${quote(word[0]!)} is not an SI prefix (a f p n u µ m k M G T).`;
  return '';
}

/** After a bad number, a unit that follows belongs to it; swallow it so it is not reported again. */
export function skipUnit(c: Cursor, ctx: ExpressionContext): void {
  const u = c.peek();
  if (u?.kind === 'ident' && !ctx.stopWords.has(u.text) && !c.isOp('=', 1)) c.next();
  else if (c.isOp('%') || c.isOp('\u00b0')) c.next();
}

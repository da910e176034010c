// Expressions: a small recursive-descent parser over + - * / ^ and parentheses, numbers with SI prefixes
// and units, and parameter references; and an evaluator that carries a dimension with every value.
import { quote, type Reporter } from './diagnostics';
import { spanRange, tokenRange, type Token } from './lexer';
import type { SourceRange } from './source';
import {
  DIMENSIONLESS,
  describeDimension,
  divDim,
  isDimensionless,
  lookupUnit,
  mulDim,
  scaleLiteral,
  powDim,
  sameDimension,
  unitsLike,
  type Dimension,
} from './unitTable';

export type Expr =
  | {
      readonly kind: 'number';
      /** The value in SI after applying the unit. */
      readonly value: number;
      readonly dim: Dimension;
      readonly numberText: string;
      readonly unitText?: string;
      readonly range: SourceRange;
    }
  | { readonly kind: 'ref'; readonly name: string; readonly range: SourceRange }
  | { readonly kind: 'neg'; readonly operand: Expr; readonly range: SourceRange }
  | { readonly kind: 'group'; readonly inner: Expr; readonly range: SourceRange }
  | {
      readonly kind: 'binary';
      readonly op: '+' | '-' | '*' | '/' | '^';
      readonly left: Expr;
      readonly right: Expr;
      readonly range: SourceRange;
    }
  /** A part already reported as an error (bad number, unknown unit): evaluates to nothing, silently. */
  | { readonly kind: 'invalid'; readonly range: SourceRange };

/** A token stream with a position; shared by the statement and expression parsers. */
export class Cursor {
  pos = 0;
  constructor(readonly tokens: readonly Token[]) {}
  peek(k = 0): Token | undefined {
    return this.tokens[this.pos + k];
  }
  next(): Token | undefined {
    return this.tokens[this.pos++];
  }
  atEnd(): boolean {
    return this.pos >= this.tokens.length;
  }
  isOp(text: string, k = 0): boolean {
    const t = this.peek(k);
    return t !== undefined && t.kind === 'op' && t.text === text;
  }
  isIdent(k = 0, text?: string): boolean {
    const t = this.peek(k);
    return t !== undefined && t.kind === 'ident' && (text === undefined || t.text === text);
  }
  last(): Token | undefined {
    return this.tokens[this.pos - 1];
  }
}

export interface ExpressionContext {
  readonly sink: Reporter;
  /** Words that end an expression after a number instead of being read as its unit (field names, flags). */
  readonly stopWords: ReadonlySet<string>;
}

const join = (a: SourceRange, b: SourceRange): SourceRange => ({ start: a.start, end: b.end });

/** True when the next token can start an expression. */
export function startsExpression(c: Cursor): boolean {
  const t = c.peek();
  if (!t) return false;
  if (t.kind === 'number' || t.kind === 'badNumber') return true;
  // `name =` and `name.field` begin the next field or override: the value before them is missing.
  if (t.kind === 'ident') return !c.isOp('=', 1) && !c.isOp('.', 1);
  return t.kind === 'op' && (t.text === '(' || t.text === '-' || t.text === '+');
}

/**
 * Parses one expression starting at the cursor. Returns `undefined` without a diagnostic when nothing there
 * can start an expression (the caller says what value is missing); otherwise reports its own errors and
 * returns an expression that may contain `invalid` parts.
 */
export function parseExpression(c: Cursor, ctx: ExpressionContext): Expr | undefined {
  if (!startsExpression(c)) return undefined;
  const first = c.peek()!;
  budget = MAX_OPERATORS;
  try {
    return parseSum(c, ctx);
  } catch (e) {
    if (!(e instanceof TooComplex)) throw e;
    // Reported once; the rest of the line belongs to the same runaway expression.
    ctx.sink.error(
      'syntax',
      `This expression is too long or nested too deeply (at most ${MAX_OPERATORS} operators and parentheses).`,
      tokenRange(e.token),
    );
    c.pos = c.tokens.length;
    return { kind: 'invalid', range: spanRange(first, c.tokens[c.tokens.length - 1]!) };
  }
}

/**
 * Every operator and parenthesis spends one unit, so an expression tree is never deeper than this and
 * neither parsing nor evaluating it can exhaust the stack, whatever the text.
 */
const MAX_OPERATORS = 400;
let budget = MAX_OPERATORS;

class TooComplex extends Error {
  constructor(readonly token: Token) {
    super('expression too complex');
  }
}

function spend(t: Token): void {
  if (--budget < 0) throw new TooComplex(t);
}

function operand(c: Cursor, ctx: ExpressionContext, after: Token, parse: () => Expr): Expr {
  if (startsExpression(c)) return parse();
  ctx.sink.error('syntax', `Expected a value after ${quote(after.text)}.`, tokenRange(after));
  return { kind: 'invalid', range: tokenRange(after) };
}

function parseSum(c: Cursor, ctx: ExpressionContext): Expr {
  let left = parseProduct(c, ctx);
  while (c.isOp('+') || c.isOp('-')) {
    const op = c.next()!;
    spend(op);
    const right = operand(c, ctx, op, () => parseProduct(c, ctx));
    left = { kind: 'binary', op: op.text as '+' | '-', left, right, range: join(left.range, right.range) };
  }
  return left;
}

function parseProduct(c: Cursor, ctx: ExpressionContext): Expr {
  let left = parseUnary(c, ctx);
  while (c.isOp('*') || c.isOp('/')) {
    const op = c.next()!;
    spend(op);
    const right = operand(c, ctx, op, () => parseUnary(c, ctx));
    left = { kind: 'binary', op: op.text as '*' | '/', left, right, range: join(left.range, right.range) };
  }
  return left;
}

function parseUnary(c: Cursor, ctx: ExpressionContext): Expr {
  if (c.isOp('-') || c.isOp('+')) {
    const op = c.next()!;
    spend(op);
    const inner = operand(c, ctx, op, () => parseUnary(c, ctx));
    const range = join(tokenRange(op), inner.range);
    return op.text === '-' ? { kind: 'neg', operand: inner, range } : { kind: 'group', inner, range };
  }
  return parsePower(c, ctx);
}

function parsePower(c: Cursor, ctx: ExpressionContext): Expr {
  const base = parsePrimary(c, ctx);
  if (!c.isOp('^')) return base;
  const op = c.next()!;
  spend(op);
  // Right-associative, and binds tighter than unary minus on its left: -2^2 = -(2^2).
  const exponent = operand(c, ctx, op, () => parseUnary(c, ctx));
  return { kind: 'binary', op: '^', left: base, right: exponent, range: join(base.range, exponent.range) };
}

function parsePrimary(c: Cursor, ctx: ExpressionContext): Expr {
  const t = c.next()!;
  if (t.kind === 'badNumber') {
    ctx.sink.error('syntax', `Bad number ${quote(t.text)}.`, tokenRange(t));
    skipUnit(c, ctx);
    return { kind: 'invalid', range: tokenRange(t) };
  }
  if (t.kind === 'number') return parseUnit(c, ctx, t);
  if (t.kind === 'ident') return { kind: 'ref', name: t.text, range: tokenRange(t) };
  // `(`
  spend(t);
  const inner = operand(c, ctx, t, () => parseSum(c, ctx));
  if (c.isOp(')')) {
    const close = c.next()!;
    return { kind: 'group', inner, range: spanRange(t, close) };
  }
  ctx.sink.error('syntax', 'Missing `)` to close this `(`.', tokenRange(t));
  return { kind: 'invalid', range: join(tokenRange(t), inner.range) };
}

/** After a bad number, a unit that follows belongs to it; swallow it so it is not reported again. */
function skipUnit(c: Cursor, ctx: ExpressionContext): void {
  const u = c.peek();
  if (u?.kind === 'ident' && !ctx.stopWords.has(u.text) && !c.isOp('=', 1)) c.next();
  else if (c.isOp('%') || c.isOp('\u00b0')) c.next();
}

function parseUnit(c: Cursor, ctx: ExpressionContext, num: Token): Expr {
  const value = Number(num.text);
  const plain: Expr = {
    kind: 'number',
    value,
    dim: DIMENSIONLESS,
    numberText: num.text,
    range: tokenRange(num),
  };
  const u = c.peek();
  if (!u) return plain;
  if (u.kind === 'op' && (u.text === '%' || u.text === '\u00b0')) {
    c.next();
    const info = lookupUnit(u.text)!;
    return {
      ...plain,
      value: scaleLiteral(num.text, info.exp10),
      dim: info.dim,
      unitText: u.text,
      range: spanRange(num, u),
    };
  }
  if (u.kind !== 'ident') return plain;
  const info = lookupUnit(u.text);
  if (!info) {
    // A word right after a number is its unit, unless it is the next field, a flag, or a name being
    // assigned (`gm1 = 1, load.cap = …` in a corner).
    if (ctx.stopWords.has(u.text) || c.isOp('=', 1) || c.isOp('.', 1)) return plain;
    c.next();
    const like = unitsLike(u.text);
    const hint =
      u.text === 'ugf'
        ? ` Write ${quote(`${num.text} * ugf`)}.`
        : like.length
          ? ` Did you mean ${like.map(quote).join(' or ')}?`
          : lookupUnit(u.text.replace(/^./, ''))
            ? ` ${quote(u.text[0]!)} is not an SI prefix (a f p n u µ m k M G T).`
            : '';
    ctx.sink.error('unit', `Unknown unit ${quote(u.text)}.${hint}`, tokenRange(u));
    return { kind: 'invalid', range: spanRange(num, u) };
  }
  c.next();
  let unitText = u.text;
  let exp10 = info.exp10;
  let dim = info.dim;
  let last = u;
  // A compound unit is written without spaces: `V/us`, `A/V`.
  const slash = c.peek();
  const den = c.peek(1);
  if (
    slash?.kind === 'op' &&
    slash.text === '/' &&
    slash.start === u.end &&
    den?.kind === 'ident' &&
    den.start === slash.end
  ) {
    const denInfo = lookupUnit(den.text);
    if (!denInfo || isDimensionless(denInfo.dim)) {
      c.next();
      c.next();
      ctx.sink.error(
        'unit',
        `Unknown unit ${quote(den.text)} in ${quote(`${u.text}/${den.text}`)}.`,
        tokenRange(den),
      );
      return { kind: 'invalid', range: spanRange(num, den) };
    }
    c.next();
    c.next();
    unitText = `${u.text}/${den.text}`;
    exp10 -= denInfo.exp10;
    dim = divDim(dim, denInfo.dim);
    last = den;
  }
  return {
    kind: 'number',
    value: scaleLiteral(num.text, exp10),
    dim,
    numberText: num.text,
    unitText,
    range: spanRange(num, last),
  };
}

export interface Quantity {
  readonly value: number;
  readonly dim: Dimension;
}

/** Resolves a name to its value; returns `undefined` after reporting (or when already reported). */
export type Resolver = (name: string, range: SourceRange) => Quantity | undefined;

/** Evaluates an expression; `undefined` means an error was reported somewhere inside. */
export function evaluate(e: Expr, resolve: Resolver, sink: Reporter): Quantity | undefined {
  switch (e.kind) {
    case 'number':
      return { value: e.value, dim: e.dim };
    case 'invalid':
      return undefined;
    case 'ref':
      return resolve(e.name, e.range);
    case 'group':
      return evaluate(e.inner, resolve, sink);
    case 'neg': {
      const v = evaluate(e.operand, resolve, sink);
      return v && { value: -v.value, dim: v.dim };
    }
    case 'binary': {
      const a = evaluate(e.left, resolve, sink);
      const b = evaluate(e.right, resolve, sink);
      if (!a || !b) return undefined;
      switch (e.op) {
        case '+':
        case '-':
          if (!sameDimension(a.dim, b.dim)) {
            const verb = e.op === '+' ? 'add' : 'subtract';
            sink.error(
              'unit',
              `Cannot ${verb} ${describeDimension(b.dim)} ${e.op === '+' ? 'to' : 'from'} ${describeDimension(a.dim)}.`,
              e.range,
            );
            return undefined;
          }
          return { value: e.op === '+' ? a.value + b.value : a.value - b.value, dim: a.dim };
        case '*':
          return { value: a.value * b.value, dim: mulDim(a.dim, b.dim) };
        case '/':
          return { value: a.value / b.value, dim: divDim(a.dim, b.dim) };
        case '^':
          if (!isDimensionless(b.dim)) {
            sink.error(
              'unit',
              `An exponent must be a plain number, not ${describeDimension(b.dim)}.`,
              e.right.range,
            );
            return undefined;
          }
          return { value: a.value ** b.value, dim: powDim(a.dim, b.value) };
      }
    }
  }
}

/** Calls `visit` on every name reference in the expression. */
export function forEachRef(e: Expr, visit: (name: string, range: SourceRange) => void): void {
  switch (e.kind) {
    case 'ref':
      visit(e.name, e.range);
      return;
    case 'neg':
      forEachRef(e.operand, visit);
      return;
    case 'group':
      forEachRef(e.inner, visit);
      return;
    case 'binary':
      forEachRef(e.left, visit);
      forEachRef(e.right, visit);
      return;
    default:
      return;
  }
}

// Expressions: a small recursive-descent parser over + - || * / ^, parentheses, function calls, numbers with
// their units (see unitLiteral.ts) and parameter references. Evaluation is in evaluateExpression.ts.
import { quote, type Reporter } from './diagnostics';
import { closest } from './closestWord';
import {
  FUNCTION_NAMES,
  FUNCTION_SIGNATURES,
  isFunctionName,
  type FunctionName,
} from './expressionFunctions';
import { spanRange, tokenRange, type Token } from './lexer';
import type { SourceRange } from './source';
import { parseLiteral, skipUnit } from './unitLiteral';
import type { Dimension } from './unitTable';

export type BinaryOp = '+' | '-' | '*' | '/' | '^' | '||';

export type Expr =
  | {
      readonly kind: 'number';
      /** The value in SI after applying the unit. */
      readonly value: number;
      readonly dim: Dimension;
      readonly numberText: string;
      /** The unit as written, without spaces (`pF`, `uA/V^2`, `/V`). */
      readonly unitText?: string;
      readonly range: SourceRange;
    }
  | { readonly kind: 'ref'; readonly name: string; readonly range: SourceRange }
  | { readonly kind: 'neg'; readonly operand: Expr; readonly range: SourceRange }
  | { readonly kind: 'group'; readonly inner: Expr; readonly range: SourceRange }
  | {
      readonly kind: 'binary';
      readonly op: BinaryOp;
      readonly left: Expr;
      readonly right: Expr;
      readonly range: SourceRange;
    }
  | {
      readonly kind: 'call';
      readonly fn: FunctionName;
      readonly args: readonly Expr[];
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
 * Every operator, parenthesis and argument separator spends one unit, so an expression tree is never deeper
 * than this and neither parsing nor evaluating it can exhaust the stack, whatever the text.
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

// Precedence, loosest first: + -, then || (so `a / b || c / d` is (a/b) || (c/d) and `r1 || r2 + r3` is
// (r1 || r2) + r3), then * /, then unary minus, then ^.
function parseSum(c: Cursor, ctx: ExpressionContext): Expr {
  let left = parseParallel(c, ctx);
  while (c.isOp('+') || c.isOp('-')) {
    const op = c.next()!;
    spend(op);
    const right = operand(c, ctx, op, () => parseParallel(c, ctx));
    left = { kind: 'binary', op: op.text as '+' | '-', left, right, range: join(left.range, right.range) };
  }
  return left;
}

function parseParallel(c: Cursor, ctx: ExpressionContext): Expr {
  let left = parseProduct(c, ctx);
  while (c.isOp('||')) {
    const op = c.next()!;
    spend(op);
    const right = operand(c, ctx, op, () => parseProduct(c, ctx));
    left = { kind: 'binary', op: '||', left, right, range: join(left.range, right.range) };
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
  if (t.kind === 'number') return parseLiteral(c, ctx, t);
  if (t.kind === 'ident') {
    if (c.isOp('(')) return parseCall(c, ctx, t);
    return { kind: 'ref', name: t.text, range: tokenRange(t) };
  }
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

/** `name(arg, …)`: a known function, or a reported mistake whose arguments are still read (and checked). */
function parseCall(c: Cursor, ctx: ExpressionContext, name: Token): Expr {
  const open = c.next()!;
  spend(open);
  const args: Expr[] = [operand(c, ctx, open, () => parseSum(c, ctx))];
  while (c.isOp(',')) {
    const comma = c.next()!;
    spend(comma);
    args.push(operand(c, ctx, comma, () => parseSum(c, ctx)));
  }
  if (!c.isOp(')')) {
    ctx.sink.error('syntax', 'Missing `)` to close this `(`.', tokenRange(open));
    return { kind: 'invalid', range: join(tokenRange(name), args[args.length - 1]!.range) };
  }
  const range = spanRange(name, c.next()!);
  if (!isFunctionName(name.text)) {
    const near = closest(name.text, FUNCTION_NAMES);
    ctx.sink.error(
      'syntax',
      `Unknown function ${quote(name.text)}.${near ? ` Did you mean ${quote(near)}?` : ''} The functions are ${FUNCTION_NAMES.join(', ')}; to multiply, write ${quote(`${name.text} * (…)`)}.`,
      tokenRange(name),
    );
    return { kind: 'invalid', range };
  }
  const sig = FUNCTION_SIGNATURES[name.text];
  if (args.length < sig.min || args.length > sig.max) {
    const want = sig.min === sig.max ? 'one value' : `${sig.min} or more values`;
    ctx.sink.error('syntax', `${quote(name.text)} takes ${want}: ${quote(sig.usage)}.`, range);
    return { kind: 'invalid', range };
  }
  return { kind: 'call', fn: name.text, args, range };
}

/** Calls `visit` on every node of the expression, parents before children. */
export function walkExpr(e: Expr, visit: (e: Expr) => void): void {
  visit(e);
  switch (e.kind) {
    case 'neg':
      walkExpr(e.operand, visit);
      return;
    case 'group':
      walkExpr(e.inner, visit);
      return;
    case 'binary':
      walkExpr(e.left, visit);
      walkExpr(e.right, visit);
      return;
    case 'call':
      for (const a of e.args) walkExpr(a, visit);
      return;
    case 'number':
    case 'ref':
    case 'invalid':
      return;
    default: {
      const never: never = e;
      return never;
    }
  }
}

/** Calls `visit` on every name reference in the expression (a function's name is not a reference). */
export function forEachRef(e: Expr, visit: (name: string, range: SourceRange) => void): void {
  walkExpr(e, (x) => {
    if (x.kind === 'ref') visit(x.name, x.range);
  });
}

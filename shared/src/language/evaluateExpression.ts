// Evaluates an expression to a value with its dimension. Every mistake is reported where it is made: a
// dimension mismatch at the operation (with the literals whose units led there), a value a double cannot
// hold at the operation that produced it. `undefined` means an error was reported somewhere inside.
import type { Reporter } from './diagnostics';
import { representation, type Representation } from './doublePrecision';
import type { Expr } from './expression';
import { applyFunction, parallel, parallelProblem, type Quantity } from './expressionFunctions';
import type { LanguageDiagnostic, SourceRange } from './source';
import { describeDimension, divDim, isDimensionless, mulDim, powDim, sameDimension } from './unitTable';

export type { Quantity } from './expressionFunctions';

export type Related = NonNullable<LanguageDiagnostic['related']>;

/** Resolves a name to its value; returns `undefined` after reporting (or when already reported). */
export type Resolver = (name: string, range: SourceRange) => Quantity | undefined;

/** Where an expression's dimension comes from (the literals with units it is built of), for messages. */
export type DimensionSources = (e: Expr) => Related;

const MAX_RELATED = 6;

export function evaluate(
  e: Expr,
  resolve: Resolver,
  sink: Reporter,
  sources: DimensionSources = () => [],
): Quantity | undefined {
  // The common leaves first, before any helper is made for the operations below.
  if (e.kind === 'number') return { value: e.value, dim: e.dim };
  if (e.kind === 'ref') return resolve(e.name, e.range);
  const evalIn = (x: Expr): Quantity | undefined => evaluate(x, resolve, sink, sources);
  const dimensionError = (message: string, range: SourceRange, ...parts: Expr[]): undefined => {
    sink.error('unit', message, range, parts.flatMap(sources).slice(0, MAX_RELATED));
    return undefined;
  };
  /** The result of an operation, or an error at it when a double cannot hold the exact value. */
  const result = (
    value: number,
    dim: Quantity['dim'],
    lostToZero: boolean,
    why?: string,
  ): Quantity | undefined => {
    const rep = representation(value, lostToZero);
    if (rep === 'ok') return { value, dim };
    sink.error('plausibility', why ?? UNREPRESENTABLE[rep], e.range);
    return undefined;
  };
  switch (e.kind) {
    case 'invalid':
      return undefined;
    case 'group':
      return evalIn(e.inner);
    case 'neg': {
      const v = evalIn(e.operand);
      return v && { value: -v.value, dim: v.dim };
    }
    case 'call': {
      const args: Quantity[] = [];
      for (const a of e.args) {
        const q = evalIn(a);
        if (!q) return undefined;
        args.push(q);
      }
      const r = applyFunction(e.fn, args);
      if ('message' in r) {
        const at = r.argument !== undefined ? e.args[r.argument]! : e;
        if (r.code === 'unit') return dimensionError(r.message, at.range, at);
        sink.error(r.code, r.message, at.range);
        return undefined;
      }
      const lost = (e.fn === 'sqrt' || e.fn === 'abs') && args[0]!.value !== 0;
      return result(r.value, r.dim, lost);
    }
    case 'binary': {
      const a = evalIn(e.left);
      const b = evalIn(e.right);
      if (!a || !b) return undefined;
      switch (e.op) {
        case '+':
        case '-':
          if (!sameDimension(a.dim, b.dim)) {
            const verb = e.op === '+' ? 'add' : 'subtract';
            return dimensionError(
              `Cannot ${verb} ${describeDimension(b.dim)} ${e.op === '+' ? 'to' : 'from'} ${describeDimension(a.dim)}.`,
              e.range,
              e.left,
              e.right,
            );
          }
          return result(e.op === '+' ? a.value + b.value : a.value - b.value, a.dim, false);
        case '||': {
          const problem = parallelProblem(a.dim, b.dim);
          if (problem) return dimensionError(problem, e.range, e.left, e.right);
          return result(
            parallel(a.value, b.value),
            a.dim,
            a.value !== 0 && b.value !== 0,
            'These two resistances cancel in parallel (1/a + 1/b = 0): the result is infinite.',
          );
        }
        case '*':
          return result(a.value * b.value, mulDim(a.dim, b.dim), a.value !== 0 && b.value !== 0);
        case '/':
          if (b.value === 0) {
            sink.error('plausibility', 'Division by zero.', e.range);
            return undefined;
          }
          return result(a.value / b.value, divDim(a.dim, b.dim), a.value !== 0);
        case '^':
          if (!isDimensionless(b.dim))
            return dimensionError(
              `An exponent must be a plain number, not ${describeDimension(b.dim)}.`,
              e.right.range,
              e.right,
            );
          return result(
            a.value ** b.value,
            powDim(a.dim, b.value),
            a.value !== 0,
            a.value === 0 && b.value < 0 ? 'Zero to a negative power is a division by zero.' : undefined,
          );
        default: {
          const never: never = e.op;
          return never;
        }
      }
    }
    default: {
      const never: never = e;
      return never;
    }
  }
}

const UNREPRESENTABLE: Readonly<Record<Exclude<Representation, 'ok'>, string>> = {
  overflow:
    'This value is too large to compute with (beyond about 1.8e308 in SI units): values this far beyond any circuit cannot be analysed.',
  underflow:
    'This value is too small to compute with (below about 2.2e-308 in SI units; it would round to zero): values this far beyond any circuit cannot be analysed.',
  'not-a-number': 'This value is not a real number (a negative number to a fractional power?).',
};

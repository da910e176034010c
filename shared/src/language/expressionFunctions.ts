// The functions an expression may call and the parallel combination `a || b`, each with its dimension
// rule. A rule returns the result or says what is wrong; the evaluator reports it at the right place.
import { describeDimension, isDimensionless, powDim, sameDimension, DIM, type Dimension } from './unitTable';

export const FUNCTION_NAMES = ['sqrt', 'min', 'max', 'abs', 'log10'] as const;
export type FunctionName = (typeof FUNCTION_NAMES)[number];

export const isFunctionName = (word: string): word is FunctionName =>
  (FUNCTION_NAMES as readonly string[]).includes(word);

/** How many arguments each function takes, and how to write it, for messages and docs. */
export const FUNCTION_SIGNATURES: Readonly<
  Record<FunctionName, { readonly min: number; readonly max: number; readonly usage: string }>
> = {
  sqrt: { min: 1, max: 1, usage: 'sqrt(x)' },
  min: { min: 2, max: Infinity, usage: 'min(a, b, …)' },
  max: { min: 2, max: Infinity, usage: 'max(a, b, …)' },
  abs: { min: 1, max: 1, usage: 'abs(x)' },
  log10: { min: 1, max: 1, usage: 'log10(x)' },
};

export interface Quantity {
  readonly value: number;
  readonly dim: Dimension;
}

/** What is wrong with a call: the code it is reported under, the message, and which argument to blame. */
export interface CallProblem {
  readonly code: 'unit' | 'plausibility';
  readonly message: string;
  /** Index of the argument to point at; the whole call when absent. */
  readonly argument?: number;
}

const EPS = 1e-9;
const isEven = (x: number): boolean => Math.abs(x / 2 - Math.round(x / 2)) < EPS;

export function applyFunction(fn: FunctionName, args: readonly Quantity[]): Quantity | CallProblem {
  switch (fn) {
    case 'sqrt': {
      const x = args[0]!;
      // sqrt(A^2/V^2) is A/V; sqrt(A/V) would need half powers of volt and ampere, which no field has.
      if (!x.dim.every(isEven))
        return {
          code: 'unit',
          message: `\`sqrt\` needs a quantity whose unit has even powers (such as A²/V²); this is ${describeDimension(x.dim)}.`,
          argument: 0,
        };
      if (x.value < 0)
        return {
          code: 'plausibility',
          message: '`sqrt` of a negative value has no real result.',
          argument: 0,
        };
      return { value: Math.sqrt(x.value), dim: powDim(x.dim, 0.5) };
    }
    case 'min':
    case 'max': {
      const first = args[0]!;
      for (let i = 1; i < args.length; i++)
        if (!sameDimension(args[i]!.dim, first.dim))
          return {
            code: 'unit',
            message: `\`${fn}\` compares values of one kind: this is ${describeDimension(args[i]!.dim)}, the first is ${describeDimension(first.dim)}.`,
            argument: i,
          };
      const pick = fn === 'min' ? Math.min : Math.max;
      return { value: pick(...args.map((a) => a.value)), dim: first.dim };
    }
    case 'abs':
      return { value: Math.abs(args[0]!.value), dim: args[0]!.dim };
    case 'log10': {
      const x = args[0]!;
      if (!isDimensionless(x.dim))
        return {
          code: 'unit',
          message: `\`log10\` needs a plain number, not ${describeDimension(x.dim)}: divide by a reference first (\`log10(r / 1 kohm)\`).`,
          argument: 0,
        };
      if (x.value <= 0)
        return { code: 'plausibility', message: '`log10` needs a positive value.', argument: 0 };
      return { value: Math.log10(x.value), dim: x.dim };
    }
    default: {
      const never: never = fn;
      return never;
    }
  }
}

/**
 * Two resistances in parallel, 1/(1/a + 1/b). A zero is a short circuit, so the result is zero; an infinite
 * one is an open circuit and leaves the other. Never NaN for non-NaN inputs: `a || -a` is an open circuit
 * (infinite), which the caller reports.
 */
export function parallel(a: number, b: number): number {
  if (a === 0 || b === 0) return 0;
  if (!Number.isFinite(a)) return b;
  if (!Number.isFinite(b)) return a;
  // a / (1 + a/b) with |a| <= |b|: the ratio lies in [-1, 1], so no step overflows or underflows where the
  // result itself does not (1/a + 1/b would overflow for resistances below about 1e-308).
  const [small, large] = Math.abs(a) <= Math.abs(b) ? [a, b] : [b, a];
  return small / (1 + small / large);
}

/** The parallel operator combines resistances (or plain numbers); anything else is a mistake worth naming. */
export function parallelProblem(a: Dimension, b: Dimension): string | undefined {
  const ok = (d: Dimension): boolean => sameDimension(d, DIM.ohm) || isDimensionless(d);
  if (!sameDimension(a, b))
    return `\`||\` combines two resistances; this puts ${describeDimension(b)} in parallel with ${describeDimension(a)}.`;
  if (ok(a)) return undefined;
  const hint =
    sameDimension(a, DIM.F) || sameDimension(a, DIM.S)
      ? ' Capacitances and conductances in parallel add: write `a + b`.'
      : '';
  return `\`||\` combines resistances (1/(1/a + 1/b)), not ${describeDimension(a)}.${hint}`;
}

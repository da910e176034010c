// Which numbers a double holds faithfully. A literal or a computed value beyond these limits has already lost
// its meaning (rounded to infinity, to zero, or to a subnormal with fewer significant bits), so the language
// refuses it where it appears instead of letting the engine compute with it.

/** The smallest positive normal double (2^-1022); below it precision is lost gradually, then entirely. */
export const MIN_NORMAL = 2.2250738585072014e-308;

export type Representation = 'ok' | 'overflow' | 'underflow' | 'not-a-number';

/**
 * How a double represents a value. `lostToZero`: the exact value was not zero (its operands or its digits
 * were not), so a result of zero is an underflow rather than an answer.
 */
export function representation(value: number, lostToZero = false): Representation {
  if (Number.isNaN(value)) return 'not-a-number';
  if (!Number.isFinite(value)) return 'overflow';
  if (value === 0) return lostToZero ? 'underflow' : 'ok';
  return Math.abs(value) < MIN_NORMAL ? 'underflow' : 'ok';
}

/** True when a decimal literal's digits before any exponent are not all zero (`0.0e5` is zero; `1e-400` is not). */
export function hasNonzeroDigit(literal: string): boolean {
  for (let i = 0; i < literal.length; i++) {
    const c = literal.charCodeAt(i);
    if (c === 101 || c === 69) return false; // `e`, `E`: the exponent starts
    if (c >= 49 && c <= 57) return true;
  }
  return false;
}

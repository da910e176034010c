// Words for values that are not ordinary finite numbers, so that no surface shows NaN, Infinity or a
// signed zero. Every formatter asks here first: one wording everywhere.

/** A value the engine could not compute (NaN). */
export const NOT_COMPUTED = 'not computed';
/** A positive infinity with no more specific meaning. */
export const UNBOUNDED = 'unbounded';
/** A negative infinity with no more specific meaning. */
export const UNBOUNDED_NEGATIVE = 'unbounded (negative)';

/**
 * A gain margin with no −180° crossing to read it at: no gain makes the loop oscillate there, so the margin
 * has no bound. Distinct from NOT_COMPUTED, which is a value the engine could not find.
 */
export const GAIN_MARGIN_UNBOUNDED = 'unbounded';

/** An open-loop DC gain of zero: a series capacitor (or no path) blocks DC from input to output. */
export const DC_GAIN_ZERO = 'no DC path: the gain at DC is zero';
/** An infinite open-loop DC gain: a pole at the origin. */
export const DC_GAIN_UNBOUNDED = 'integrator: unbounded DC gain';

/**
 * The words for a non-finite `value`, or undefined for a finite one. `positive` and `negative` name what
 * ±∞ means where it is used (a zero at infinity, an unbounded margin).
 */
export function nonFiniteWords(
  value: number,
  positive: string = UNBOUNDED,
  negative: string = UNBOUNDED_NEGATIVE,
): string | undefined {
  if (Number.isNaN(value)) return NOT_COMPUTED;
  if (value === Infinity) return positive;
  if (value === -Infinity) return negative;
  return undefined;
}

/**
 * A finite number as plain text with `digits` significant digits: `12.3`, `0.00456`, and beyond the range
 * people read without an exponent `1.23e308` / `4.94e-324` (no `+`, so the text can be pasted back into a
 * design file). Negative zero, and anything that rounds to zero, prints as `0`; a non-finite value (as a
 * scaled value may become) comes out in words.
 */
export function plainNumber(value: number, digits = 3): string {
  const words = nonFiniteWords(value);
  if (words !== undefined) return words;
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  // Rounding is done on the text: Number(x.toPrecision(3)) overflows to ∞ near the top of the range.
  if (magnitude >= 1e15 || magnitude < 1e-6) {
    const [mantissa, exponent] = value.toExponential(digits - 1).split('e');
    return `${trimZeros(mantissa!)}e${exponent!.replace('+', '')}`;
  }
  const rounded = Number(value.toPrecision(digits));
  return rounded === 0 ? '0' : String(rounded);
}

const trimZeros = (mantissa: string) => (mantissa.includes('.') ? mantissa.replace(/\.?0+$/, '') : mantissa);

/**
 * A finite number with a fixed count of decimals (`61.4`), falling back to plainNumber where fixed
 * notation would be unreadable; a value that rounds to zero prints without a minus sign.
 */
export function fixedNumber(value: number, decimals: number): string {
  if (!Number.isFinite(value) || Math.abs(value) >= 1e15) return plainNumber(value, 4);
  const text = value.toFixed(decimals);
  return Number(text) === 0 ? (0).toFixed(decimals) : text;
}

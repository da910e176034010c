// Magnitude, frequency and damping of a root s = re + j·im. Math.hypot scales before squaring, so roots
// near the ends of double range (the analysis accepts values over 60 decades) neither overflow nor vanish.

export interface ComplexValue {
  readonly re: number;
  readonly im: number;
}

/** |s| in the unit of s (rad/s for a root). */
export const modulus = (s: ComplexValue): number => Math.hypot(s.re, s.im);

/** |s| / 2π: a root's frequency in Hz. */
export const modulusHz = (s: ComplexValue): number => modulus(s) / (2 * Math.PI);

/** Damping ratio ζ = −Re s / |s|; a root at the origin counts as fully damped (1). */
export function dampingRatio(s: ComplexValue): number {
  const m = modulus(s);
  return m === 0 ? 1 : -s.re / m;
}

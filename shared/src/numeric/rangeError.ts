// A computation whose inputs or intermediate values leave the range of double precision (an entry that
// overflows to ±∞, a NaN, a scaling that cannot be represented). The numeric routines throw it instead of
// looping or returning garbage; the analysis turns it into a problem a designer can read.

export class OutOfRangeError extends Error {
  override readonly name = 'OutOfRangeError';
}

/** Throw OutOfRangeError (with `what` in the message) unless every entry of `a` is finite. */
export function requireFinite(a: Float64Array, what: string): void {
  for (let i = 0; i < a.length; i++) {
    if (!Number.isFinite(a[i])) throw new OutOfRangeError(`${what} has an entry outside double precision`);
  }
}

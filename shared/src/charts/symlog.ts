// Symmetric logarithmic scaling for the s-plane map: roots spread over many decades on both sides of the
// imaginary axis, and a plain log axis cannot show a sign or zero. T(v) = sign(v)·log10(1 + |v|/v0) is
// linear near zero (|v| ≪ v0) and logarithmic beyond, and it is exactly invertible.

export function symlog(v: number, v0: number): number {
  return Math.sign(v) * Math.log10(1 + Math.abs(v) / v0);
}

export function symlogInverse(t: number, v0: number): number {
  return Math.sign(t) * v0 * (10 ** Math.abs(t) - 1);
}

/** A knee one decade below the smallest non-zero coordinate, so every root sits in the logarithmic part. */
export function symlogKnee(values: readonly number[]): number {
  const mags = values.map(Math.abs).filter((v) => v > 0 && Number.isFinite(v));
  if (mags.length === 0) return 1;
  return Math.min(...mags) / 10;
}

/** Tick positions (in transformed units) at 0 and ±10^k for every decade from the knee to `maxAbs`. */
export function symlogTicks(v0: number, maxAbs: number): number[] {
  const ticks = [0];
  const first = Math.ceil(Math.log10(v0 * 10));
  const last = Math.ceil(Math.log10(Math.max(maxAbs, v0 * 10)));
  const step = Math.max(1, Math.ceil((last - first + 1) / 6));
  for (let k = first; k <= last; k += step) {
    const t = symlog(10 ** k, v0);
    ticks.push(t, -t);
  }
  return ticks.sort((a, b) => a - b);
}

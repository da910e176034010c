// A root of the s-plane as a designer reads it: real and imaginary parts in Hz (s / 2π).
import type { Complex } from '../analysis/types';
import { formatHz } from './si';
import { NOT_COMPUTED } from './special';

/** `+11.9 MHz ± j8.50 MHz` for a pair given by its upper member, `−808 Hz` for a real root. */
export function formatRootHz(s: Complex): string {
  if (Number.isNaN(s.re) || Number.isNaN(s.im)) return NOT_COMPUTED;
  if (!Number.isFinite(s.re) || !Number.isFinite(s.im)) return formatHz(Infinity);
  const re = s.re / (2 * Math.PI);
  const im = Math.abs(s.im) / (2 * Math.PI);
  const sign = re > 0 ? '+' : re < 0 ? '−' : '';
  const real = `${sign}${formatHz(Math.abs(re))}`;
  return im === 0 ? real : `${real} ± j${formatHz(im)}`;
}

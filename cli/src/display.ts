// Number-to-text conventions shared by the analyze tables and the HTML report.
import { formatDb, formatHz, formatSi, roundSignificant } from '../../shared/src/format/si';

const TWO_PI = 2 * Math.PI;

/** dB text that reads right at zero gain too (`−∞ dB`, not `-Infinity dB`). */
export const dbText = (db: number): string =>
  Number.isFinite(db) ? formatDb(db) : `${db > 0 ? '' : '−'}∞ dB`;

/** Slew rates in the unit designers quote them in. */
export const slewText = (vPerS: number): string => `${roundSignificant(vPerS / 1e6)} V/us`;

/** A root magnitude in rad/s with its frequency beside it. */
export const radText = (w: number): string =>
  Number.isFinite(w) ? `${formatSi(w, 'rad/s')} (${formatHz(w / TWO_PI)})` : '∞';

/** `−1.23 kHz` for a real root, `−25.1 MHz + j12 MHz` for one of a pair, `+95.5 MHz` in the right half-plane. */
export function rootText(re: number, im: number): string {
  const r = (re > 0 ? '+' : '') + formatSi(re / TWO_PI, 'Hz');
  return im === 0 ? r : `${r} ${im < 0 ? '−' : '+'} j${formatSi(Math.abs(im) / TWO_PI, 'Hz')}`;
}

/** A relative error as a percentage; rounding noise of an exact match reads as such, not as `3.97e-14 %`. */
export function errorText(relativeError: number): string {
  if (!Number.isFinite(relativeError)) return '—';
  if (relativeError === 0) return '0 %';
  if (relativeError < 1e-4) return '< 0.01 %';
  return `${roundSignificant(relativeError * 100)} %`;
}

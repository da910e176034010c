// Display of SI values with prefixes: the only place numbers become text for people. Non-finite values
// come out in words (format/special.ts), never as NaN or Infinity.
import { fixedNumber, NOT_COMPUTED, nonFiniteWords, plainNumber } from './special';

const PREFIXES: readonly [number, string][] = [
  [1e12, 'T'],
  [1e9, 'G'],
  [1e6, 'M'],
  [1e3, 'k'],
  [1, ''],
  [1e-3, 'm'],
  [1e-6, 'u'],
  [1e-9, 'n'],
  [1e-12, 'p'],
  [1e-15, 'f'],
  [1e-18, 'a'],
];

const LARGEST_PREFIX = PREFIXES[0]![0];
const SMALLEST_PREFIX = PREFIXES[PREFIXES.length - 1]![0];

/** Round to `digits` significant digits (3 by default), as a number. */
export function roundSignificant(value: number, digits = 3): number {
  if (value === 0 || !Number.isFinite(value)) return value;
  const rounded = Number(value.toPrecision(digits));
  // Rounding up the largest doubles overflows: keep the value itself there.
  return Number.isFinite(rounded) ? rounded : value;
}

/**
 * `formatSi(1.1e-12, 'F')` → `1.1 pF`; `formatSi(2.2e-3, 'S')` → `2.2 mS`. The prefix is chosen so that the
 * mantissa lies in [1, 1000); trailing zeros are dropped. Resistances use `ohm` spelled out so that the
 * text can be pasted back into a design file (`kohm`, `Mohm`). Values beyond the prefixes use an exponent
 * (`1e308 F`); NaN and ±∞ come out in words (`positive`/`negative` say what ±∞ means in context).
 */
export function formatSi(
  value: number,
  unit: string,
  digits = 3,
  positive?: string,
  negative?: string,
): string {
  const words = nonFiniteWords(value, positive, negative);
  if (words !== undefined) return words;
  const rounded = roundSignificant(Math.abs(value), digits);
  if (rounded === 0) return `0 ${unit}`.trim();
  const sign = value < 0 ? '-' : '';
  if (rounded >= LARGEST_PREFIX * 1000 || rounded < SMALLEST_PREFIX * (1 - 1e-12)) {
    return `${sign}${plainNumber(rounded, digits)} ${unit}`.trim();
  }
  let [scale, prefix] = PREFIXES[PREFIXES.length - 1]!;
  for (const [s, p] of PREFIXES) {
    if (rounded >= s * (1 - 1e-12)) {
      [scale, prefix] = [s, p];
      break;
    }
  }
  let mantissa = roundSignificant(rounded / scale, digits);
  if (mantissa >= 1000 && scale < LARGEST_PREFIX) {
    const up = PREFIXES[PREFIXES.findIndex(([s]) => s === scale) - 1]!;
    [scale, prefix] = up;
    mantissa = roundSignificant(rounded / scale, digits);
  }
  return `${sign}${mantissa} ${prefix}${unit}`.trim();
}

/** Frequencies in Hz with a prefix (`12.3 MHz`); +∞ is a root at infinity. */
export const formatHz = (hz: number, digits = 3): string =>
  formatSi(hz, 'Hz', digits, 'infinite (no finite frequency)');

/** Degrees with one decimal (`61.4°`). */
export const formatDeg = (deg: number): string =>
  nonFiniteWords(deg, NOT_COMPUTED, NOT_COMPUTED) ?? `${fixedNumber(deg, 1)}°`;

/** Decibels with one decimal (`12.0 dB`); −∞ dB is a gain of exactly zero. */
export const formatDb = (db: number): string =>
  nonFiniteWords(db, 'unbounded', 'zero gain (−∞ dB)') ?? `${fixedNumber(db, 1)} dB`;

// Display of SI values with prefixes: the only place numbers become text for people.
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

/** Round to `digits` significant digits (3 by default), as a number. */
export function roundSignificant(value: number, digits = 3): number {
  if (value === 0 || !Number.isFinite(value)) return value;
  return Number(value.toPrecision(digits));
}

/**
 * `formatSi(1.1e-12, 'F')` → `1.1 pF`; `formatSi(2.2e-3, 'S')` → `2.2 mS`. The prefix is chosen so that the
 * mantissa lies in [1, 1000); trailing zeros are dropped. Resistances use `ohm` spelled out so that the
 * text can be pasted back into a design file (`kohm`, `Mohm`).
 */
export function formatSi(value: number, unit: string, digits = 3): string {
  if (Number.isNaN(value)) return `NaN ${unit}`.trim();
  if (!Number.isFinite(value)) return `${value > 0 ? '' : '−'}∞ ${unit}`.trim();
  if (value === 0) return `0 ${unit}`.trim();
  const rounded = roundSignificant(Math.abs(value), digits);
  let [scale, prefix] = PREFIXES[PREFIXES.length - 1]!;
  for (const [s, p] of PREFIXES) {
    if (rounded >= s * (1 - 1e-12)) {
      [scale, prefix] = [s, p];
      break;
    }
  }
  let mantissa = roundSignificant(rounded / scale, digits);
  if (mantissa >= 1000 && scale < 1e12) {
    const up = PREFIXES[PREFIXES.findIndex(([s]) => s === scale) - 1]!;
    [scale, prefix] = up;
    mantissa = roundSignificant(rounded / scale, digits);
  }
  const sign = value < 0 ? '-' : '';
  return `${sign}${mantissa} ${prefix}${unit}`.trim();
}

/** Frequencies in Hz with a prefix (`12.3 MHz`). */
export const formatHz = (hz: number, digits = 3): string => formatSi(hz, 'Hz', digits);

/** Degrees with one decimal (`61.4°`). */
export const formatDeg = (deg: number): string => `${deg.toFixed(1)}°`;

/** Decibels with one decimal (`12.0 dB`). */
export const formatDb = (db: number): string => `${db.toFixed(1)} dB`;

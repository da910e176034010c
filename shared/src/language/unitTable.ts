// Units and dimensions of the language. A dimension is a vector of exponents over volt, ampere and second
// (every electrical SI unit is a product of these), plus three quantities kept apart on purpose so that
// they never mix with the rest: degrees of phase, decibels, and multiples of the unity-gain frequency.

/** Exponents of [V, A, s, deg, dB, ugf]. */
export type Dimension = readonly [number, number, number, number, number, number];

export const DIMENSIONLESS: Dimension = [0, 0, 0, 0, 0, 0];
export const DIM = {
  one: DIMENSIONLESS,
  ohm: [1, -1, 0, 0, 0, 0] as Dimension,
  S: [-1, 1, 0, 0, 0, 0] as Dimension,
  F: [-1, 1, 1, 0, 0, 0] as Dimension,
  A: [0, 1, 0, 0, 0, 0] as Dimension,
  V: [1, 0, 0, 0, 0, 0] as Dimension,
  s: [0, 0, 1, 0, 0, 0] as Dimension,
  Hz: [0, 0, -1, 0, 0, 0] as Dimension,
  'V/s': [1, 0, -1, 0, 0, 0] as Dimension,
  deg: [0, 0, 0, 1, 0, 0] as Dimension,
  dB: [0, 0, 0, 0, 1, 0] as Dimension,
  ugf: [0, 0, 0, 0, 0, 1] as Dimension,
} as const;
export type NamedDimension = keyof typeof DIM;

/** What people call a quantity of each named dimension, for messages. */
export const DIMENSION_WORDS: Readonly<Record<NamedDimension, string>> = {
  one: 'a plain number',
  ohm: 'a resistance (ohm)',
  S: 'a transconductance (S)',
  F: 'a capacitance (F)',
  A: 'a current (A)',
  V: 'a voltage (V)',
  s: 'a time (s)',
  Hz: 'a frequency (Hz)',
  'V/s': 'a slew rate (V/s)',
  deg: 'a phase (deg)',
  dB: 'a level in decibels (dB)',
  ugf: 'a multiple of the unity-gain frequency (N * ugf)',
};

const EPS = 1e-9;
export const sameDimension = (a: Dimension, b: Dimension): boolean =>
  a.every((x, i) => Math.abs(x - b[i]!) < EPS);
export const isDimensionless = (d: Dimension): boolean => sameDimension(d, DIMENSIONLESS);
export const mulDim = (a: Dimension, b: Dimension): Dimension =>
  a.map((x, i) => x + b[i]!) as unknown as Dimension;
export const divDim = (a: Dimension, b: Dimension): Dimension =>
  a.map((x, i) => x - b[i]!) as unknown as Dimension;
export const powDim = (a: Dimension, p: number): Dimension => a.map((x) => x * p) as unknown as Dimension;

const NAMED = Object.entries(DIM) as [NamedDimension, Dimension][];

export function namedDimension(d: Dimension): NamedDimension | undefined {
  for (const [name, dim] of NAMED) if (sameDimension(d, dim)) return name;
  return undefined;
}

const BASE_SYMBOLS = ['V', 'A', 's', 'deg', 'dB', 'ugf'];
/** A short name for a dimension: `ohm`, `F`, `1`, or a product such as `V^2·s^-1`. */
export function dimensionName(d: Dimension): string {
  const named = namedDimension(d);
  if (named) return named === 'one' ? '1' : named;
  const round = (x: number): string => String(Number(x.toFixed(6)));
  return d
    .map((x, i) => (Math.abs(x) < EPS ? '' : x === 1 ? BASE_SYMBOLS[i]! : `${BASE_SYMBOLS[i]}^${round(x)}`))
    .filter(Boolean)
    .join('·');
}

/** How to describe a dimension to a person. */
export function describeDimension(d: Dimension): string {
  const named = namedDimension(d);
  return named ? DIMENSION_WORDS[named] : `a quantity in ${dimensionName(d)}`;
}

export interface UnitInfo {
  /** Factor to SI, as a power of ten (every unit of the language scales by one): `pF` → -12. */
  readonly exp10: number;
  readonly dim: Dimension;
}

/**
 * The SI value of a decimal literal in a unit scaled by 10^exp10, rounded once: `10 uA` is exactly the double
 * nearest 1e-5, not 10 × 1e-6 (which is 9.999999999999999e-6).
 */
export function scaleLiteral(literal: string, exp10: number): number {
  const m = /^([^eE]*)(?:[eE]([+-]?\d+))?$/.exec(literal);
  // A fractional power of ten (a unit to the power 0.5) has no exact decimal form: scale in floating point.
  if (!m || !Number.isInteger(exp10)) return Number(literal) * 10 ** exp10;
  const exp = Number(m[2] ?? 0) + exp10;
  return Number(`${m[1]}e${exp}`);
}

/** SI prefixes as powers of ten. Both the micro sign (U+00B5) and Greek mu (U+03BC) are accepted, as is `u`. */
export const PREFIX_EXPONENTS: Readonly<Record<string, number>> = {
  a: -18,
  f: -15,
  p: -12,
  n: -9,
  u: -6,
  '\u00b5': -6,
  '\u03bc': -6,
  m: -3,
  k: 3,
  M: 6,
  G: 9,
  T: 12,
};

/** SI prefixes as factors. */
export const PREFIX_SCALES: Readonly<Record<string, number>> = Object.fromEntries(
  Object.entries(PREFIX_EXPONENTS).map(([p, e]) => [p, 10 ** e]),
);

const PREFIXABLE: readonly [string, Dimension][] = [
  ['ohm', DIM.ohm],
  ['\u03a9', DIM.ohm],
  ['\u2126', DIM.ohm],
  ['S', DIM.S],
  ['F', DIM.F],
  ['A', DIM.A],
  ['V', DIM.V],
  ['s', DIM.s],
  ['Hz', DIM.Hz],
];

const PLAIN: readonly [string, UnitInfo][] = [
  ['deg', { exp10: 0, dim: DIM.deg }],
  ['\u00b0', { exp10: 0, dim: DIM.deg }],
  ['dB', { exp10: 0, dim: DIM.dB }],
  ['%', { exp10: -2, dim: DIMENSIONLESS }],
  ['ppm', { exp10: -6, dim: DIMENSIONLESS }],
];

const TABLE = new Map<string, UnitInfo>();
for (const [symbol, dim] of PREFIXABLE) {
  TABLE.set(symbol, { exp10: 0, dim });
  for (const [prefix, exp10] of Object.entries(PREFIX_EXPONENTS)) TABLE.set(prefix + symbol, { exp10, dim });
}
for (const [symbol, info] of PLAIN) TABLE.set(symbol, info);
// A prefix on its own is a scale factor: `1 M` is one mega of whatever unit the field implies.
for (const [prefix, exp10] of Object.entries(PREFIX_EXPONENTS))
  TABLE.set(prefix, { exp10, dim: DIMENSIONLESS });

/** A single unit spelling (no `/`): `pF`, `Mohm`, `kΩ`, `deg`, `%`, `M`. */
export function lookupUnit(spelling: string): UnitInfo | undefined {
  return TABLE.get(spelling);
}

/** Spellings that differ from `spelling` only in letter case: for "did you mean" hints. */
export function unitsLike(spelling: string): string[] {
  const lower = spelling.toLowerCase();
  const out: string[] = [];
  for (const key of TABLE.keys()) if (key.length > 1 && key.toLowerCase() === lower) out.push(key);
  return out;
}

/** Every single-unit spelling plus the usual compound ones, for completion. */
export const UNIT_SPELLINGS: readonly string[] = [
  ...[...TABLE.keys()].filter((k) => lookupUnit(k)!.dim !== DIMENSIONLESS || k === '%' || k === 'ppm'),
  'A/V',
  'mA/V',
  'uA/V',
  'A/V^2',
  'uA/V^2',
  'V/s',
  'V/ms',
  'V/us',
  'V/ns',
];

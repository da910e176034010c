// SI quantities as branded numbers: the core computes in plain SI, and the brand keeps a resistance from
// being passed where a capacitance is expected. Conversion to display units happens only at the edges
// (see format/si.ts).
declare const unit: unique symbol;
export type Si<U extends string> = number & { readonly [unit]: U };

export type Ohms = Si<'ohm'>;
export type Farads = Si<'F'>;
export type Siemens = Si<'S'>;
export type Amperes = Si<'A'>;
export type Volts = Si<'V'>;
export type Seconds = Si<'s'>;
export type Hertz = Si<'Hz'>;
export type RadPerSecond = Si<'rad/s'>;
export type Degrees = Si<'deg'>;
export type Decibels = Si<'dB'>;
export type VoltsPerSecond = Si<'V/s'>;
/** A dimensionless number (a gain in V/V, a feedback factor, a tolerance as a fraction). */
export type Ratio = Si<'1'>;

/** Tag a plain number with its SI unit. The only place a brand is created from nothing. */
export const si = <T extends Si<string>>(value: number): T => value as T;

/** The magnitude of a voltage gain in decibels, 20·log10|A| (−∞ for a zero gain). */
export const gainDb = (gain: number): Decibels => si<Decibels>(20 * Math.log10(Math.abs(gain)));

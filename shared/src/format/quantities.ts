// Display of the dimensionless and composite quantities designers read in findings: gains, percentages,
// ratios and slew rates. Non-finite values come out in words (format/special.ts).
import { formatDb } from './si';
import {
  DC_GAIN_UNBOUNDED,
  DC_GAIN_ZERO,
  fixedNumber,
  GAIN_MARGIN_UNBOUNDED,
  NOT_COMPUTED,
  nonFiniteWords,
  plainNumber,
} from './special';
import { gainDb } from '../units';

/** A fraction as a percentage with fixed decimals (`0.123` → `12.3 %`). */
export const formatPercent = (fraction: number, decimals = 1): string =>
  nonFiniteWords(fraction) ?? `${fixedNumber(fraction * 100, decimals)} %`;

/** A tolerance as written in a requirement: three significant digits of percent (`0.001` → `0.1 %`). */
export const formatTolerance = (fraction: number): string =>
  nonFiniteWords(fraction) ?? `${plainNumber(fraction * 100, 3)} %`;

/** A ratio to a reference (`3.5 ×`); say what the reference is after it (`× UGF`). */
export const formatRatio = (ratio: number, digits = 3): string =>
  nonFiniteWords(ratio) ?? `${plainNumber(ratio, digits)} ×`;

/** A voltage gain in V/V (`200 V/V`). */
export const formatGain = (vPerV: number, digits = 3): string =>
  nonFiniteWords(vPerV) ?? `${plainNumber(vPerV, digits)} V/V`;

/** A slew rate given in V/s, shown in V/µs (`4 V/µs`). */
export const formatSlewRate = (voltsPerSecond: number): string =>
  nonFiniteWords(voltsPerSecond) ?? `${plainNumber(voltsPerSecond / 1e6, 3)} V/µs`;

/**
 * An open-loop DC gain given in V/V, shown in dB. Zero (no DC path) and infinity (a pole at the origin)
 * are exact states of the network, named in words.
 */
export function formatDcGain(vPerV: number): string {
  if (Number.isNaN(vPerV)) return NOT_COMPUTED;
  if (vPerV === 0) return DC_GAIN_ZERO;
  if (!Number.isFinite(vPerV)) return DC_GAIN_UNBOUNDED;
  return formatDb(gainDb(vPerV));
}

/**
 * The gain margin of an analyzed loop (`loop.gainMarginDb`): absent means the phase never reaches −180°,
 * which is an unbounded margin, not a missing one. Surfaces without an analysis say `not computed`.
 */
export function formatGainMargin(db: number | undefined): string {
  if (db === undefined) return GAIN_MARGIN_UNBOUNDED;
  return nonFiniteWords(db) ?? formatDb(db);
}

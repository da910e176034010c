// The settling tolerances the step response can judge. Below about 1e-12 of the final value the band is
// within a few thousand ulps of it, so roundoff in the propagated state (each step adds a few ulps) decides
// whether a sample is "in the band" rather than the circuit; a band of the final value or wider says nothing.

import { formatTolerance } from '../format/quantities';

/** Smallest tolerance (fraction of the final value) the settling time is computed for. */
export const MIN_SETTLE_TOLERANCE = 1e-12;
/** Tolerances at or above this fraction of the final value are refused. */
export const MAX_SETTLE_TOLERANCE = 1;

/** Why `tolerance` cannot be used for settling, or undefined when it can. */
export function settleToleranceProblem(tolerance: number): string | undefined {
  if (!Number.isFinite(tolerance)) return 'the settling tolerance is not a finite number';
  if (tolerance <= 0) return 'the settling tolerance must be positive';
  if (tolerance < MIN_SETTLE_TOLERANCE) {
    return (
      `the settling tolerance ${formatTolerance(tolerance)} is finer than ${formatTolerance(MIN_SETTLE_TOLERANCE)}, ` +
      'below what double precision resolves around the final value'
    );
  }
  if (tolerance >= MAX_SETTLE_TOLERANCE) {
    return 'the settling tolerance must be below 100 % of the final value';
  }
  return undefined;
}

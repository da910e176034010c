// Settling into ±tolerance of the final value, read from the exact closed-loop step response.
import type { StepResponse } from '../analysis/types';
import { settleBand } from '../analysis/stepResponse';
import { settleToleranceProblem } from '../analysis/settleTolerance';
import { formatPercent, formatTolerance } from '../format/quantities';
import { formatSi } from '../format/si';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { compensationRange, primaryCompensation, requirementOf } from './locate';

/**
 * Settling time for `tolerance`: the engine's value when it was computed for that tolerance, else the
 * last sample outside the band (undefined when the response is still outside it at the end, or when the
 * tolerance is one the step response refuses).
 */
export function settlingTimeFor(step: StepResponse, tolerance: number): number | undefined {
  if (settleToleranceProblem(tolerance) !== undefined) return undefined;
  if (Math.abs(step.tolerance - tolerance) <= 1e-12 * tolerance) return step.settlingTime;
  const band = settleBand(step.y, step.final, tolerance);
  let last = -1;
  for (let i = 0; i < step.y.length; i++) if (Math.abs(step.y[i]! - step.final) > band) last = i;
  if (last === step.y.length - 1) return undefined;
  return last < 0 ? 0 : step.t[last + 1];
}

export const settlingCheck: Check = (input: CheckInput) =>
  acrossRuns(input, 'settling', (run): Hit[] => {
    const req = requirementOf(run.model, 'settle');
    if (!req) return [];
    const step = run.analysis.step;
    const pct = formatTolerance(req.tolerance);
    const range = compensationRange(input.source, primaryCompensation(run.model), run);
    const required = {
      range: req.origin.range,
      message: `required: settle to ±${pct} within ${formatSi(req.within, 's')}`,
    };
    const refused =
      settleToleranceProblem(req.tolerance) ?? (step ? undefined : run.analysis.stepUnavailable);
    if (refused !== undefined) {
      return [
        {
          key: 'unavailable',
          severity: 'warning',
          message: `Settling cannot be checked: ${refused}`,
          range: req.origin.range,
          related: [],
          badness: 0,
        },
      ];
    }
    if (!step) return [];
    const ts = settlingTimeFor(step, req.tolerance);
    if (ts !== undefined && ts <= req.within) return [];
    return [
      {
        key: 'settle',
        severity: 'error',
        message:
          ts === undefined
            ? `The step response does not settle into ±${pct} within the computed span (required ${formatSi(req.within, 's')})`
            : `Settling to ±${pct} takes ${formatSi(ts, 's')}, longer than the required ${formatSi(req.within, 's')}` +
              (step.overshootPct > 0 ? ` (overshoot ${formatPercent(step.overshootPct / 100)})` : ''),
        range,
        related: [required],
        badness: ts === undefined ? Infinity : ts / req.within,
      },
    ];
  });

// Settling into ±tolerance of the final value, read from the exact closed-loop step response, or with
// `step` from the large-signal one (analysis/largeSignalStep.ts).
import type { DesignAnalysis, LargeSignalStep, StepResponse } from '../analysis/types';
import type { Requirement } from '../language/model';
import { largeSignalSummary } from '../format/largeSignal';
import { settleBand } from '../analysis/stepResponse';
import { settleToleranceProblem } from '../analysis/settleTolerance';
import { formatPercent, formatTolerance } from '../format/quantities';
import { formatSi } from '../format/si';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { compensationRange, primaryCompensation } from './locate';
import type { CornerRun } from '../report';

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

type SettleRequirement = Extract<Requirement, { kind: 'settle' }>;

/** The large-signal step computed for `req` (a `settle … step` requirement), when it was. */
export function largeSignalOf(req: SettleRequirement, a: DesignAnalysis): LargeSignalStep | undefined {
  const l = a.largeSignalStep;
  return req.step !== undefined && l && l.amplitude === req.step && l.tolerance === req.tolerance
    ? l
    : undefined;
}

/** The settling time `req` is judged by: the large-signal one with `step`, else the small-signal one. */
export function requiredSettlingTime(req: SettleRequirement, a: DesignAnalysis): number | undefined {
  if (req.step !== undefined) return largeSignalOf(req, a)?.settlingTime;
  return a.step ? settlingTimeFor(a.step, req.tolerance) : undefined;
}

/** Why the response `req` is judged by was not computed, when it was asked for and not computed. */
export function settlingUnavailable(req: SettleRequirement, a: DesignAnalysis): string | undefined {
  if (req.step === undefined) return a.stepUnavailable;
  return a.largeSignalStepUnavailable ?? (a.step ? undefined : a.stepUnavailable);
}

/** Every `settle` requirement of the design, small- or large-signal, each judged on its own. */
export const settlingCheck: Check = (input: CheckInput) =>
  acrossRuns(input, 'settling', (run): Hit[] =>
    run.model.requirements.flatMap((req, i) => (req.kind === 'settle' ? settleHits(input, run, req, i) : [])),
  );

function settleHits(input: CheckInput, run: CornerRun, req: SettleRequirement, index: number): Hit[] {
  const a = run.analysis;
  const step = req.step !== undefined ? largeSignalOf(req, a) : a.step;
  const pct = formatTolerance(req.tolerance);
  const range = compensationRange(input.source, primaryCompensation(run.model), run);
  const what = req.step !== undefined ? `a ${formatSi(req.step, 'V')} step to ±${pct}` : `to ±${pct}`;
  const required = {
    range: req.origin.range,
    message: `required: settle ${what} within ${formatSi(req.within, 's')}`,
  };
  const refused = settleToleranceProblem(req.tolerance) ?? (step ? undefined : settlingUnavailable(req, a));
  if (refused !== undefined) {
    return [
      {
        key: `unavailable ${index}`,
        severity: 'warning',
        message: `Settling cannot be checked: ${refused}`,
        range: req.origin.range,
        related: [],
        badness: 0,
      },
    ];
  }
  if (!step) return [];
  const ts = requiredSettlingTime(req, a);
  if (ts !== undefined && ts <= req.within) return [];
  const large = largeSignalOf(req, a);
  // An overshoot that rounds to 0.0 % says nothing; the small-signal wording keeps any overshoot.
  const overshoot = large ? step.overshootPct >= 0.05 : step.overshootPct > 0;
  // When slewing is most of the settling, the stage whose bias limits it is where to act.
  const limiting =
    large && large.limitingStage !== undefined && ts !== undefined && large.slewingTime > ts / 2
      ? run.model.stages.find((st) => st.name === large.limitingStage)
      : undefined;
  const biasRange = limiting?.origin.fields['bias']?.range;
  return [
    {
      key: `settle ${index}`,
      severity: 'error',
      message:
        (ts === undefined
          ? `The step response does not settle ${req.step !== undefined ? `(${what})` : `into ±${pct}`} within the computed span (required ${formatSi(req.within, 's')})`
          : `Settling ${what} takes ${formatSi(ts, 's')}, longer than the required ${formatSi(req.within, 's')}` +
            (overshoot ? ` (overshoot ${formatPercent(step.overshootPct / 100)})` : '')) +
        // Which part dominates: the slewing or the linear tail (the small-signal time beside it).
        (large ? `: ${largeSignalSummary(large, a.slew)}` : ''),
      range,
      related: [
        required,
        ...(biasRange && limiting
          ? [{ range: biasRange, message: `the bias of stage ${limiting.name} limits the slewing` }]
          : []),
      ],
      badness: ts === undefined ? Infinity : ts / req.within,
    },
  ];
}

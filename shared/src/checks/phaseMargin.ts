// Phase margin (the smallest over the loop's unity crossings, in (−180°, 180°]) against `require pm` or the
// default.
import { formatDeg, formatHz } from '../format/si';
import type { DesignModel } from '../language/model';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { defined } from './fixes';
import { compensationFixes } from './compensationFixes';
import type { RuleSlack } from './solveKnob';
import { compensationRange, primaryCompensation, requirementOf, violates, judgedAsLoop } from './locate';

export function requiredPhaseMargin(
  model: DesignModel,
  fallback: number,
): { op: '>=' | '<='; value: number } {
  const req = requirementOf(model, 'pm');
  return req ? { op: req.op, value: req.value } : { op: '>=', value: fallback };
}

export const phaseMarginCheck: Check = (input: CheckInput) =>
  acrossRuns(
    input,
    'phase-margin',
    (run): Hit[] => {
      if (!judgedAsLoop(run.model)) return [];
      const pm = run.analysis.loop.phaseMarginDeg;
      const ugf = run.analysis.loop.ugfHz;
      if (pm === undefined || ugf === undefined) return [];
      const req = requirementOf(run.model, 'pm');
      const { op, value } = requiredPhaseMargin(run.model, input.settings.phaseMargin);
      if (!violates(op, pm, value)) return [];
      const comp = primaryCompensation(run.model);
      // The closed loop's own poles say whether it is unstable; a margin at or below 0° says so only when
      // the open loop has no right-half-plane poles (the stability rule reports the rest).
      const stability = run.analysis.stability;
      const unstable = stability ? stability.verdict === 'unstable' : pm <= 0;
      const bound = op === '>=' ? 'below the required' : 'above the allowed';
      const origin = req ? 'required' : 'default';
      return [
        {
          key: 'pm',
          severity: unstable || pm <= 0 || req ? 'error' : 'warning',
          message:
            `Phase margin ${formatDeg(pm)} at the unity-gain frequency ${formatHz(ugf)} is ${bound} ` +
            `${formatDeg(value)}${req ? '' : ' (default)'}` +
            (unstable ? ': the closed loop is unstable' : ''),
          range: compensationRange(input.source, comp, run),
          related: defined([
            req
              ? { range: req.origin.range, message: `${origin} phase margin ${op} ${formatDeg(value)}` }
              : undefined,
          ]),
          badness: op === '>=' ? value - pm : pm - value,
        },
      ];
    },
    () => compensationFixes(input, phaseMarginSlack(input.settings.phaseMargin), 'the required phase margin'),
  );

/** The phase-margin rule's slack in one run, in degrees. */
export function phaseMarginSlack(fallback: number): RuleSlack {
  return {
    slack: (run) => {
      const pm = run.analysis.loop.phaseMarginDeg;
      if (pm === undefined) return NaN;
      const { op, value } = requiredPhaseMargin(run.model, fallback);
      return op === '>=' ? pm - value : value - pm;
    },
    describe: (run) => {
      const pm = run.analysis.loop.phaseMarginDeg;
      return pm === undefined ? 'no unity crossing' : `phase margin ${formatDeg(pm)}`;
    },
  };
}

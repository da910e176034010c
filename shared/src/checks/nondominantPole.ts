// The first non-dominant pole against the UGF: p2 ≥ 2.2·GBW gives about 60° with the zero far away (AH).
import type { DesignAnalysis, Pole } from '../analysis/types';
import { formatHz } from '../format/si';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { compensationFixes } from './compensationFixes';
import { PROXY_NOTE, isMillerCompensated, statedPhaseMarginHolds } from './proxy';
import type { RuleSlack } from './solveKnob';
import {
  compensationRange,
  participationText,
  primaryCompensation,
  sortedPoles,
  judgedAsLoop,
} from './locate';

/** A LHP zero this close to a pole (relative) cancels it for this rule: its residue is negligible. */
const CANCELLED = 0.02;

/** The lowest pole above the dominant one that no LHP zero cancels. */
export function firstNondominantPole(analysis: DesignAnalysis): Pole | undefined {
  const poles = sortedPoles(analysis.poles);
  return poles
    .slice(1)
    .find(
      (p) =>
        !analysis.zeros.some(
          (z) => !z.rhp && Number.isFinite(z.hz) && Math.abs(z.hz - p.hz) <= CANCELLED * p.hz,
        ),
    );
}

export const nondominantPoleCheck: Check = (input: CheckInput) => {
  const proxy = statedPhaseMarginHolds(input);
  return acrossRuns(
    input,
    'nondominant-pole',
    (run): Hit[] => {
      // A rule of Miller compensation: a loop compensated at its output (a regulator's output capacitor
      // and its ESR zero) is judged by its margins alone.
      if (!judgedAsLoop(run.model) || !isMillerCompensated(run.model)) return [];
      const ugf = run.analysis.loop.ugfHz;
      const p2 = firstNondominantPole(run.analysis);
      const factor = input.settings.nondominantFactor;
      if (ugf === undefined || !p2 || p2.hz >= factor * ugf) return [];
      const comp = primaryCompensation(run.model);
      return [
        {
          key: 'p2',
          severity: proxy ? 'info' : 'warning',
          message:
            `Non-dominant pole at ${formatHz(p2.hz)} is only ${+(p2.hz / ugf).toPrecision(3)} × the UGF ` +
            `(${formatHz(ugf)}); it should lie at or above ${factor} × UGF (${formatHz(factor * ugf)})` +
            (proxy ? PROXY_NOTE : ''),
          range: compensationRange(input.source, comp, run),
          related: p2.participation.length
            ? [
                {
                  range: input.source.nameRange,
                  message: `the pole's nodes: ${participationText(p2.participation)}`,
                },
              ]
            : [],
          badness: (factor * ugf) / p2.hz,
        },
      ];
    },
    ({ worst }) =>
      worst.severity === 'info'
        ? []
        : compensationFixes(
            input,
            nondominantSlack(input.settings.nondominantFactor),
            'the non-dominant pole placement',
          ),
  );
};

/** ln(p2 / (factor · UGF)): ≥ 0 where the first non-dominant pole lies at or above factor × UGF. */
function nondominantSlack(factor: number): RuleSlack {
  return {
    slack: (run) => {
      const ugf = run.analysis.loop.ugfHz;
      if (ugf === undefined) return NaN;
      const p = firstNondominantPole(run.analysis);
      return p ? Math.log(p.hz / (factor * ugf)) : Infinity;
    },
    describe: (run) => {
      const ugf = run.analysis.loop.ugfHz;
      const p = firstNondominantPole(run.analysis);
      return ugf === undefined || !p
        ? 'no non-dominant pole below the crossover'
        : `non-dominant pole at ${+(p.hz / ugf).toPrecision(3)} × UGF`;
    },
  };
}

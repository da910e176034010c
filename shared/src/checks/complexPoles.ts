// Lightly damped non-dominant pole pairs and closed-loop peaking: ringing and slow settling (common practice).
import { formatDb, formatHz } from '../format/si';
import type { DesignAnalysis } from '../analysis/types';
import { acrossRuns, type Hit } from './acrossRuns';
import { compensationFixes } from './compensationFixes';
import type { RuleSlack } from './solveKnob';
import type { Check, CheckInput } from './context';
import {
  compensationRange,
  participationText,
  primaryCompensation,
  sortedPoles,
  judgedAsLoop,
} from './locate';

export const complexPolesCheck: Check = (input: CheckInput) =>
  acrossRuns(
    input,
    'complex-poles',
    (run): Hit[] => {
      if (!judgedAsLoop(run.model)) return [];
      const hits: Hit[] = [];
      const range = compensationRange(input.source, primaryCompensation(run.model), run);
      const nondominant = sortedPoles(run.analysis.poles).slice(1);
      const pair = nondominant
        .filter((p) => p.s.im > 0 && p.damping < input.settings.complexDamping)
        .sort((a, b) => a.damping - b.damping)[0];
      if (pair) {
        hits.push({
          key: 'pair',
          severity: 'warning',
          message:
            `Complex pole pair at ${formatHz(pair.hz)} with damping ζ = ${pair.damping.toFixed(2)} ` +
            `(below ${input.settings.complexDamping}): expect ringing and slow settling`,
          range,
          related: pair.participation.length
            ? [
                {
                  range: input.source.nameRange,
                  message: `the pair's nodes: ${participationText(pair.participation)}`,
                },
              ]
            : [],
          badness: input.settings.complexDamping - pair.damping,
        });
      }
      const peak = run.analysis.loop.peakingDb;
      if (peak > input.settings.peakingDb) {
        hits.push({
          key: 'peak',
          severity: 'warning',
          message: `The closed-loop response peaks ${peak.toFixed(2)} dB above its DC value (limit ${formatDb(input.settings.peakingDb)})`,
          range,
          related: [],
          badness: peak,
        });
      }
      return hits;
    },
    () => compensationFixes(input, calmSlack(input), 'calm enough poles'),
  );

/**
 * How far the run is from ringing: the least damped non-dominant pair's ζ over the limit, and the peaking
 * limit over the peaking, each as a relative slack; the smaller one decides.
 */
function calmSlack(input: CheckInput): RuleSlack {
  const least = (a: DesignAnalysis) =>
    sortedPoles(a.poles)
      .slice(1)
      .filter((p) => p.s.im > 0)
      .sort((x, y) => x.damping - y.damping)[0];
  return {
    slack: (run) => {
      const pair = least(run.analysis);
      const damping = pair ? pair.damping / input.settings.complexDamping - 1 : Infinity;
      const peaking = 1 - run.analysis.loop.peakingDb / input.settings.peakingDb;
      return Math.min(damping, peaking);
    },
    describe: (run) => {
      const pair = least(run.analysis);
      const zeta = pair ? `least damping ζ = ${pair.damping.toFixed(2)}, ` : '';
      return `${zeta}peaking ${formatDb(run.analysis.loop.peakingDb)}`;
    },
  };
}

// Lightly damped non-dominant pole pairs and closed-loop peaking: ringing and slow settling (common practice).
import { formatDb, formatHz } from '../format/si';
import type { DesignAnalysis } from '../analysis/types';
import { acrossRuns, type Hit } from './acrossRuns';
import { ccForMarginFix } from './ccForMargin';
import { defined } from './fixes';
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
    ({ worstRun }) => defined([ccForMarginFix(input, worstRun, (a) => calm(a, input), 'calmer poles')]),
  );

/** No non-dominant pair below the damping limit and no peaking above the limit. */
function calm(a: DesignAnalysis, input: CheckInput): boolean {
  const pair = sortedPoles(a.poles)
    .slice(1)
    .some((p) => p.s.im > 0 && p.damping < input.settings.complexDamping);
  return !pair && a.loop.peakingDb <= input.settings.peakingDb;
}

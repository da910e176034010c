// Fixes that raise a stage's transconductance, solved on the rule's own quantity. A gm written as a literal
// (or a parameter holding one) is set directly; a derived gm (`gm = 2 * id2 / vov2`) is changed through
// the literal parameters it is derived from, so that everything else they set (a bias, a resistance)
// follows and the model stays consistent.
import { formatSi } from '../format/si';
import type { CheckInput } from './context';
import { knobsOf } from './knobs';
import { fixesFromKnobs, solveKnob, type RuleSlack } from './solveKnob';
import type { FixSuggestion } from './types';

export function stageGmFixes(input: CheckInput, stageIndex: number, rule: RuleSlack): FixSuggestion[] {
  const nominal = input.source.nominal;
  const stage = nominal?.stages[stageIndex];
  const gmField = stage?.origin.fields['gm'];
  if (!nominal || !stage || !gmField || !input.engine) return [];
  const knobs = knobsOf(nominal, gmField, `gm of stage ${stage.name}`);
  // These rules ask for more gm: a value that meets them by lowering gm (a derived knob that also moves
  // the other stage) is no cure, so a run whose gm fell counts as failing.
  const before = new Map(input.runs.map((r) => [r.corner, r.model.stages[stageIndex]?.gm ?? 0]));
  // The stage's gm after the edit, beside the rule's quantity, so a derived fix says what it does.
  const withGm: RuleSlack = {
    slack: (run) => {
      const gm = run.model.stages[stageIndex]?.gm ?? 0;
      return gm < (before.get(run.corner) ?? 0) ? -Infinity : rule.slack(run);
    },
    describe: (run) => {
      const gm = run.model.stages[stageIndex]?.gm;
      const gmText = gm === undefined ? '' : `gm of stage ${stage.name} ${formatSi(gm, 'S')}, `;
      return `${gmText}${rule.describe(run)}`;
    },
  };
  const outcomes = knobs.map((knob) =>
    solveKnob(input, knob, withGm, (v, achieved) => `Set ${knob.name} = ${v} (${achieved})`),
  );
  const { fixes, reasons } = fixesFromKnobs(outcomes);
  if (fixes.length) return fixes.map(({ preferred: _, ...fix }) => fix);
  return reasons.length
    ? [
        {
          title: `No value of the gm of stage ${stage.name} meets the rule`,
          edits: [],
          disabled: reasons.join('; '),
        },
      ]
    : [];
}

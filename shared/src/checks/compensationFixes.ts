// Fixes that change a compensation capacitor, for the rules a capacitor cures (phase margin, gain margin,
// damping and peaking, the non-dominant pole): every capacitor of the design is a candidate, the inner one
// of a nested design included, each solved on the rule's own quantity.
import type { DesignModel } from '../language/model';
import type { CheckInput } from './context';
import { knobsOf, type Knob } from './knobs';
import { dominantPoleElement } from './locate';
import { fixesFromKnobs, solveKnob, type RuleSlack } from './solveKnob';
import type { FixSuggestion } from './types';

/** Each compensation capacitor's `cc` as a knob, labelled by its statement when there are several. */
export function compensationKnobs(nominal: DesignModel): Knob[] {
  const several = nominal.millers.length + nominal.buffered.length > 1;
  const statements = [
    ...nominal.millers.map((m) => ({ item: m, label: `miller ${m.from} -> ${m.to}` })),
    ...nominal.buffered.map((b) => ({ item: b, label: `indirect ${b.from} -> ${b.to}` })),
  ];
  return statements.flatMap(({ item, label }) => {
    const cc = item.origin.fields['cc'];
    if (!cc) return [];
    // A derived capacitor is changed through the parameters it is derived from.
    return knobsOf(nominal, cc, several ? `cc of ${label}` : 'cc');
  });
}

/**
 * One fix per capacitor that meets the rule in every corner (the cleanest, smallest change preferred), or,
 * when none does, one disabled fix that says why.
 */
export function compensationFixes(input: CheckInput, rule: RuleSlack, goal: string): FixSuggestion[] {
  const nominal = input.source.nominal;
  if (!nominal || !input.engine) return [];
  // A loop with no compensation capacitor is compensated where its dominant pole sits (a regulator's
  // output capacitor): that capacitance is the knob.
  const knobs = compensationKnobs(nominal);
  const nominalRun = input.runs.find((r) => r.corner === 'nominal');
  if (!knobs.length && nominalRun) {
    const element = dominantPoleElement(nominal, nominalRun.analysis);
    const cap = element?.origin.fields[element.field];
    if (element && cap)
      knobs.push(
        ...knobsOf(nominal, cap, element.field === 'cap' ? `cap of ${element.label}` : element.label),
      );
  }
  if (!knobs.length) return [];
  const outcomes = knobs.map((knob) =>
    solveKnob(input, knob, rule, (v, achieved) => `Set ${knob.name} = ${v} (${achieved})`),
  );
  const { fixes, reasons } = fixesFromKnobs(outcomes);
  if (fixes.length) return fixes;
  return [
    { title: `No compensation capacitor value gives ${goal}`, edits: [], disabled: reasons.join('; ') },
  ];
}

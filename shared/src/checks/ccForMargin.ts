// A fix for rules that more phase margin cures (peaking, light damping, small gain margin): Cc solved on
// the exact model for a phase margin a little above the present one, raised step by step until the
// rounded value clears the rule in every corner.
import type { DesignAnalysis } from '../analysis/types';
import { formatDeg } from '../format/si';
import type { CornerRun } from '../report';
import type { CheckInput } from './context';
import { defined, setValueEdit, solvedFix } from './fixes';
import { primaryCompensation } from './locate';
import { requiredPhaseMargin } from './phaseMargin';
import type { FixSuggestion } from './types';

/** Phase margins tried above the starting one, degrees. */
const STEPS = [0, 5, 10, 15];

export function ccForMarginFix(
  input: CheckInput,
  worstRun: CornerRun,
  meets: (analysis: DesignAnalysis, run: CornerRun) => boolean,
  cures: string,
): FixSuggestion | undefined {
  const model = worstRun.model;
  const comp = primaryCompensation(model);
  if (comp?.kind !== 'miller') return undefined;
  const nominal = input.source.nominal ?? model;
  const ccField = nominal.millers[comp.index]?.origin.fields['cc'];
  if (!ccField) return undefined;
  const required = requiredPhaseMargin(model, input.settings.phaseMargin);
  const present = worstRun.analysis.loop.phaseMarginDeg ?? 0;
  const start = Math.ceil(Math.max(required.op === '>=' ? required.value : 0, present + 5));
  for (const step of STEPS) {
    const deg = start + step;
    if (deg >= 90) break;
    const fix = solvedFix(input, {
      title: (v) => `Set cc = ${v} (${formatDeg(deg)} phase margin: ${cures})`,
      solve: (engine) => engine.solveCcForPhaseMargin(model, comp.index, deg),
      meets,
      prefer: 'up',
      unit: 'F',
      edits: (v) => defined([setValueEdit(nominal, ccField, v)]),
      preferred: true,
    });
    if (fix) return fix;
  }
  return undefined;
}

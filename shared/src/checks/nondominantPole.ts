// The first non-dominant pole against the UGF: p2 ≥ 2.2·GBW gives about 60° with the zero far away (AH).
import type { DesignAnalysis, Pole } from '../analysis/types';
import { formatHz } from '../format/si';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { defined, setValueEdit, solvedFix } from './fixes';
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

export const nondominantPoleCheck: Check = (input: CheckInput) =>
  acrossRuns(
    input,
    'nondominant-pole',
    (run): Hit[] => {
      if (!judgedAsLoop(run.model)) return [];
      const ugf = run.analysis.loop.ugfHz;
      const p2 = firstNondominantPole(run.analysis);
      const factor = input.settings.nondominantFactor;
      if (ugf === undefined || !p2 || p2.hz >= factor * ugf) return [];
      const comp = primaryCompensation(run.model);
      return [
        {
          key: 'p2',
          severity: 'warning',
          message:
            `Non-dominant pole at ${formatHz(p2.hz)} is only ${+(p2.hz / ugf).toPrecision(3)} × the UGF ` +
            `(${formatHz(ugf)}); it should lie at or above ${factor} × UGF (${formatHz(factor * ugf)})`,
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
    ({ worstRun }) => {
      const model = worstRun.model;
      const comp = primaryCompensation(model);
      const nominal = input.source.nominal ?? model;
      const ccField = comp ? nominal.millers[comp.index]?.origin.fields['cc'] : undefined;
      if (comp?.kind !== 'miller' || !ccField) return [];
      const factor = input.settings.nondominantFactor;
      return defined([
        solvedFix(input, {
          title: (v) => `Set cc = ${v} (smallest Cc with the non-dominant pole at ${factor} × UGF)`,
          solve: (engine) => engine.solveCcForNondominantPole(model, comp.index, factor),
          meets: (a) => {
            const p = firstNondominantPole(a);
            return a.loop.ugfHz !== undefined && (!p || p.hz >= factor * a.loop.ugfHz);
          },
          prefer: 'up',
          unit: 'F',
          edits: (v) => defined([setValueEdit(nominal, ccField, v)]),
          preferred: true,
        }),
      ]);
    },
  );

// A solve in one paragraph, for the editor's message after "Solve free parameters".
import { formatSi } from '../format/si';
import type { DesignSolve } from './solveDesign';

export function solveSummary(s: DesignSolve): string {
  if (s.status === 'no-free-parameters') return `Design ${s.design}: ${s.note ?? 'no free parameters'}.`;
  const values = s.values.map(
    (v) =>
      `${v.name} ${v.beforeText} → ${v.afterText}${v.atBound ? ` (at its ${v.atBound === 'low' ? 'lower' : 'upper'} bound)` : ''}`,
  );
  const show = (x: number) => (s.objective.unit ? formatSi(x, s.objective.unit) : `${+x.toPrecision(4)}`);
  const objective = `${s.objective.expression}: ${show(s.objective.before)} → ${show(s.objective.after)}`;
  if (s.status === 'met')
    return (
      `Design ${s.design}: every requirement met in every corner with ${values.join(', ')}; ${objective}` +
      (s.binding.length ? `. Limited by: ${s.binding.join('; ')}.` : '.')
    );
  return `Design ${s.design}: no values within the bounds meet every requirement together (best compromise: ${values.join(', ')}). Failing there: ${s.binding.join('; ')}.`;
}

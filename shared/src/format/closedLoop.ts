// The closed loop's stability in words, from its own poles: one home for the verdict's wording, which the
// terminal, the hover and the panel all show.
import type { DesignAnalysis } from '../analysis/types';
import { formatRootHz } from './root';

/** A word or two: `stable`, `stable (conditionally)`, `UNSTABLE`, `on the edge`; `—` when not computed. */
export function closedLoopVerdict(a: DesignAnalysis): string {
  const st = a.stability;
  if (!st) return '—';
  switch (st.verdict) {
    case 'stable':
      return st.openLoopRhpPoles ? 'stable (conditionally)' : 'stable';
    case 'unstable':
      return 'UNSTABLE';
    case 'marginal':
      return 'on the edge (poles on the axis)';
    default: {
      const never: never = st;
      return never;
    }
  }
}

/** The verdict with the closed-loop poles that decide it (upper half of each pair, at most `max`). */
export function closedLoopSummary(a: DesignAnalysis, max = 4): string {
  const poles = (a.closedLoopPoles ?? []).filter((p) => p.im >= 0);
  if (!a.stability || poles.length === 0) return `Closed loop: ${closedLoopVerdict(a)}`;
  const shown = poles.slice(0, max).map(formatRootHz).join(', ');
  const more = poles.length > max ? ` and ${poles.length - max} more` : '';
  return `Closed loop: ${closedLoopVerdict(a)}; closed-loop poles at ${shown}${more}`;
}

// Rules of thumb stand in for requirements: the non-dominant pole at 2.2 × UGF and gm2 ≥ 10 × gm1 exist to
// secure phase margin in a Miller-compensated loop (common practice). When the design states the phase
// margin it needs and meets it in every corner, such a rule has nothing to add but information.
import type { DesignModel } from '../language/model';
import type { CheckInput } from './context';
import { requirementOf } from './locate';
import { measure } from './measure';

export const PROXY_NOTE =
  ' (information only: this rule of thumb stands in for phase margin, and the stated `require pm` holds in every corner)';

/** True when the design states `require pm` and every analysed run meets it with a stable closed loop. */
export function statedPhaseMarginHolds(input: CheckInput): boolean {
  const runs = input.runs.filter((r) => !r.analysis.problems.length);
  return (
    runs.length > 0 &&
    runs.every((run) => {
      const req = requirementOf(run.model, 'pm');
      const verdict = run.analysis.stability?.verdict;
      return (
        req !== undefined &&
        verdict !== 'unstable' &&
        verdict !== 'marginal' &&
        measure(req, run.analysis).pass
      );
    })
  );
}

/** A loop compensated by a Miller or an indirect (buffered) capacitor. */
export function isMillerCompensated(model: DesignModel): boolean {
  return model.millers.length > 0 || model.buffered.length > 0;
}

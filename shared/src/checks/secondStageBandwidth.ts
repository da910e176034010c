// A Miller loop only works while the stage it wraps still has gain (common practice): the required UGF
// must lie below the frequency where that stage's own gain gm2·(R2 ∥ 1/(jωC2)) falls to one.
import { formatHz, formatSi } from '../format/si';
import type { DesignModel, Stage } from '../language/model';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { primaryCompensation, requirementOf, stageAt } from './locate';
import { judge } from './measure';
import { statedPhaseMarginHolds } from './proxy';

/**
 * Unity-gain frequency (Hz) of one stage driving its own node: |gm·R/(1 + jωRC)| = 1 at
 * ω = √((gmR)² − 1)/(RC). R includes a resistive load at the node, C the load capacitance there.
 * 0 when the stage has no gain at all (gm·R ≤ 1).
 */
export function stageUnityHz(model: DesignModel, stage: Stage): number {
  let g: number = 1 / stage.rout;
  let c: number = stage.cap;
  for (const load of model.loads) {
    if (load.node !== stage.name) continue;
    if (load.res) g += 1 / load.res;
    if (load.cap) c += load.cap;
  }
  const a = stage.gm / g;
  if (a <= 1) return 0;
  if (!(c > 0)) return Infinity;
  return (Math.sqrt(a * a - 1) * g) / c / (2 * Math.PI);
}

export const secondStageBandwidthCheck: Check = (input: CheckInput) => {
  // A rule of thumb for the UGF requirement it names: information only when that requirement (and the
  // phase margin) is judged exactly and holds in every corner.
  const ugfHolds = input.runs.every((run) => {
    const req = requirementOf(run.model, 'ugf');
    return run.analysis.problems.length > 0 || (req !== undefined && judge(req, run.analysis).pass);
  });
  const proxy = ugfHolds && statedPhaseMarginHolds(input);
  return acrossRuns(input, 'second-stage-bandwidth', (run): Hit[] => {
    const req = requirementOf(run.model, 'ugf');
    const comp = primaryCompensation(run.model);
    if (!req || req.op !== '>=' || comp?.kind !== 'miller') return [];
    const second = stageAt(run.model, comp.item.to);
    if (!second) return [];
    const limit = stageUnityHz(run.model, second.stage);
    if (req.value < limit) return [];
    const gmField = second.stage.origin.fields['gm'];
    return [
      {
        key: 'ssb',
        severity: proxy ? 'info' : 'warning',
        message:
          limit === 0
            ? `Stage ${second.stage.name} has no gain (gm·R ≤ 1), so the Miller capacitor around it cannot split the poles`
            : `Stage ${second.stage.name} keeps gain only up to about ${formatHz(limit)} ` +
              `(gm2 = ${formatSi(second.stage.gm, 'S')} into its node), below the required UGF ${formatHz(req.value)}: ` +
              'Miller compensation stops working where the stage it wraps runs out of gain' +
              (proxy ? ' (information only: the stated UGF and phase margin hold in every corner)' : ''),
        range: gmField?.range ?? second.stage.origin.range,
        related: [{ range: req.origin.range, message: `required UGF ≥ ${formatHz(req.value)}` }],
        badness: limit === 0 ? Infinity : req.value / limit,
      },
    ];
  });
};

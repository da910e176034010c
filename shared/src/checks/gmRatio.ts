// gm2 against gm1 when nothing controls the Miller zero: with Rz = 0, z/GBW = gm2/gm1 (AH).
import { formatSi } from '../format/si';
import type { CornerRun } from '../report';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { defined, setOrInsertField, solvedFix } from './fixes';
import type { RuleSlack } from './solveKnob';
import { stageGmFixes } from './stageGmFixes';
import { statedPhaseMarginHolds } from './proxy';
import { stageAt } from './locate';
import { offendingRhpZero, rhpZeroSlack, zeroFactor } from './rhpZero';
import type { FixSuggestion } from './types';

export const gmRatioCheck: Check = (input: CheckInput) => {
  // A rule of thumb for the zero's place: information only when the zero (or the phase margin it
  // protects) is judged exactly and holds.
  const factorOf = (run: CornerRun) => zeroFactor(run.model, input.settings.rhpZeroFactor);
  const proxy =
    statedPhaseMarginHolds(input) ||
    input.runs.every(
      (run) => run.analysis.problems.length > 0 || !offendingRhpZero(run.analysis, factorOf(run)),
    );
  return acrossRuns(
    input,
    'gm-ratio',
    (run): Hit[] => {
      if (run.model.buffered.length) return [];
      const hits: Hit[] = [];
      run.model.millers.forEach((miller, index) => {
        if (miller.rz !== undefined) return;
        const first = stageAt(run.model, miller.from);
        const second = stageAt(run.model, miller.to);
        if (!first || !second) return;
        const ratio = second.stage.gm / first.stage.gm;
        // A ratio written as exactly the rule (`gm2 = 10 * gm1`) passes despite rounding in the product.
        if (ratio >= input.settings.gmRatio * (1 - 1e-9)) return;
        const gmField = second.stage.origin.fields['gm'];
        const gm1Field = first.stage.origin.fields['gm'];
        hits.push({
          key: `miller${index}`,
          severity: proxy ? 'info' : 'warning',
          message:
            `gm2 = ${formatSi(second.stage.gm, 'S')} is only ${+ratio.toPrecision(3)} × gm1 ` +
            `(${formatSi(first.stage.gm, 'S')}); with no nulling resistor the right-half-plane zero gm2/Cc sits ` +
            `only ${+ratio.toPrecision(3)} × above the gain-bandwidth gm1/Cc — keep gm2 ≥ ${input.settings.gmRatio} × gm1`,
          range: gmField?.range ?? second.stage.origin.range,
          related: defined([
            gm1Field
              ? { range: gm1Field.range, message: `gm1 = ${formatSi(first.stage.gm, 'S')}` }
              : undefined,
            { range: miller.origin.range, message: 'Miller capacitor with no nulling resistor' },
          ]),
          badness: input.settings.gmRatio / ratio,
        });
      });
      return hits;
    },
    ({ worst, worstRun }) =>
      worst.severity === 'info'
        ? []
        : gmRatioFixes(input, worstRun, Number(worst.key.slice('miller'.length))),
  );
};

function gmRatioFixes(input: CheckInput, worstRun: CornerRun, index: number): FixSuggestion[] {
  const model = worstRun.model;
  const nominal = input.source.nominal ?? model;
  const miller = model.millers[index];
  const first = miller && stageAt(model, miller.from);
  const second = miller && stageAt(model, miller.to);
  if (!miller || !first || !second) return [];
  const factor = zeroFactor(model, input.settings.rhpZeroFactor);
  const zero = rhpZeroSlack(input.settings.rhpZeroFactor);
  // The rule holds in a run when gm2 ≥ ratio·gm1 there and no RHP zero lies below k·UGF.
  const ratioSlack: RuleSlack = {
    slack: (run) => {
      const f = stageAt(run.model, miller.from);
      const s2 = stageAt(run.model, miller.to);
      if (!f || !s2) return NaN;
      const ratio = Math.log(s2.stage.gm / (input.settings.gmRatio * f.stage.gm * (1 - 1e-9)));
      return Math.min(ratio, zero.slack(run));
    },
    describe: (run) => {
      const f = stageAt(run.model, miller.from);
      const s2 = stageAt(run.model, miller.to);
      const ratio = f && s2 ? `gm2 = ${+(s2.stage.gm / f.stage.gm).toPrecision(3)} × gm1, ` : '';
      return `${ratio}${zero.describe(run)}`;
    },
  };
  const raise = stageGmFixes(input, second.index, ratioSlack);
  const nominalMiller = nominal.millers[index] ?? miller;
  const rz = solvedFix(input, {
    title: (v) => `Add rz = ${v} (moves the zero to infinity)`,
    solve: (engine) => engine.solveRzForZeroAtInfinity(model, index),
    meets: (a) => !offendingRhpZero(a, factor),
    prefer: 'nearest',
    unit: 'ohm',
    edits: (v) => defined([setOrInsertField(nominal, nominalMiller.origin, 'rz', v)]),
  });
  return [...raise, ...defined([rz])];
}

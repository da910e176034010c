// gm2 against gm1 when nothing controls the Miller zero: with Rz = 0, z/GBW = gm2/gm1 (AH).
import { formatSi } from '../format/si';
import type { DesignAnalysis } from '../analysis/types';
import type { CornerRun } from '../report';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { defined, setOrInsertField, setValueEdit, solvedFix } from './fixes';
import { stageAt } from './locate';
import { offendingRhpZero, zeroFactor } from './rhpZero';
import type { FixSuggestion } from './types';

export const gmRatioCheck: Check = (input: CheckInput) =>
  acrossRuns(
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
          severity: 'warning',
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
    ({ worst, worstRun }) => gmRatioFixes(input, worstRun, Number(worst.key.slice('miller'.length))),
  );

function gmRatioFixes(input: CheckInput, worstRun: CornerRun, index: number): FixSuggestion[] {
  const model = worstRun.model;
  const nominal = input.source.nominal ?? model;
  const miller = model.millers[index];
  const first = miller && stageAt(model, miller.from);
  const second = miller && stageAt(model, miller.to);
  if (!miller || !first || !second) return [];
  const factor = zeroFactor(model, input.settings.rhpZeroFactor);
  const gmField = nominal.stages[second.index]?.origin.fields['gm'];
  // The rule holds in the edited design's run: gm2 ≥ ratio·gm1 there, and no RHP zero below k·UGF.
  const ratioMet = (run: CornerRun, a: DesignAnalysis) => {
    const f = stageAt(run.model, miller.from);
    const s2 = stageAt(run.model, miller.to);
    return (
      !!f &&
      !!s2 &&
      s2.stage.gm >= input.settings.gmRatio * f.stage.gm * (1 - 1e-9) &&
      !offendingRhpZero(a, factor)
    );
  };
  const raise = gmField
    ? solvedFix(input, {
        title: (v) => `Raise gm of stage ${second.stage.name} to ${v}`,
        // The exact gm2 that puts the zero at k·UGF, but never less than the ratio rule asks.
        solve: (engine) => {
          const solved = engine.solveGmForZero(model, second.index, factor);
          const floor = input.settings.gmRatio * first.stage.gm;
          return solved.ok
            ? { ...solved, value: Math.max(solved.value, floor) }
            : { ok: true, value: floor, achieved: floor, note: solved.reason };
        },
        meets: (a, run) => ratioMet(run, a),
        prefer: 'up',
        unit: 'S',
        edits: (v) => defined([setValueEdit(nominal, gmField, v)]),
        preferred: true,
      })
    : undefined;
  const nominalMiller = nominal.millers[index] ?? miller;
  const rz = solvedFix(input, {
    title: (v) => `Add rz = ${v} (moves the zero to infinity)`,
    solve: (engine) => engine.solveRzForZeroAtInfinity(model, index),
    meets: (a) => !offendingRhpZero(a, factor),
    prefer: 'nearest',
    unit: 'ohm',
    edits: (v) => defined([setOrInsertField(nominal, nominalMiller.origin, 'rz', v)]),
  });
  return defined([raise, rz]);
}

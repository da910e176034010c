// Right-half-plane zeros below k·UGF, located on the Miller capacitor that makes them.
import type { DesignAnalysis, Zero } from '../analysis/types';
import { formatHz, formatSi } from '../format/si';
import type { DesignModel } from '../language/model';
import type { CornerRun } from '../report';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { addRequirementEdit, defined, setOrInsertField, setValueEdit, solvedFix } from './fixes';
import { requirementOf, stageAt, judgedAsLoop } from './locate';
import type { FixSuggestion } from './types';

export function zeroFactor(model: DesignModel, fallback: number): number {
  return requirementOf(model, 'zero')?.factor ?? fallback;
}

/** The lowest RHP zero below factor × UGF, if any. */
export function offendingRhpZero(analysis: DesignAnalysis, factor: number): Zero | undefined {
  const ugf = analysis.loop.ugfHz;
  if (ugf === undefined) return undefined;
  const rhp = analysis.zeros.filter((z) => z.rhp && Number.isFinite(z.hz) && z.hz < factor * ugf);
  return rhp.sort((a, b) => a.hz - b.hz)[0];
}

/**
 * The Miller capacitor whose feed-forward path makes this zero: the one whose own zero
 * 1/(Cc(1/gm2 − Rz)) (GHLM, AH) lies in the right half-plane and nearest (in log) to it. The formula only
 * locates the element; the zero's value is the exact one.
 */
export function millerBehindZero(model: DesignModel, zero: Zero): number | undefined {
  let best: { index: number; distance: number } | undefined;
  model.millers.forEach((m, index) => {
    const second = stageAt(model, m.to);
    if (!second) return;
    const inv = 1 / second.stage.gm - (m.rz ?? 0);
    if (!(inv > 0)) return;
    const estimate = 1 / (m.cc * inv);
    const distance = Math.abs(Math.log(estimate / Math.hypot(zero.s.re, zero.s.im)));
    if (!best || distance < best.distance) best = { index, distance };
  });
  return best?.index;
}

export const rhpZeroCheck: Check = (input: CheckInput) =>
  acrossRuns(
    input,
    'rhp-zero',
    (run): Hit[] => {
      if (!judgedAsLoop(run.model)) return [];
      const factor = zeroFactor(run.model, input.settings.rhpZeroFactor);
      const zero = offendingRhpZero(run.analysis, factor);
      if (!zero) return [];
      const ugf = run.analysis.loop.ugfHz!;
      const req = requirementOf(run.model, 'zero');
      const index = millerBehindZero(run.model, zero);
      const miller = index === undefined ? undefined : run.model.millers[index];
      const second = miller ? stageAt(run.model, miller.to) : undefined;
      const gmField = second?.stage.origin.fields['gm'];
      return [
        {
          key: 'rhp',
          severity: req ? 'error' : 'warning',
          message:
            `Right-half-plane zero at ${formatHz(zero.hz)} lies below ${factor} × UGF (${formatHz(factor * ugf)}): ` +
            'it adds phase lag like a pole while the gain keeps falling' +
            (miller
              ? miller.rz === undefined
                ? '; this Miller capacitor has no nulling resistor (in a two-stage design the zero is gm2/Cc)'
                : `; rz = ${formatSi(miller.rz, 'ohm')} is below 1/gm2`
              : '; it comes from a feed-forward path of the network'),
          range: miller ? miller.origin.range : input.source.nameRange,
          related: defined([
            second && gmField
              ? {
                  range: gmField.range,
                  message: `gm = ${formatSi(second.stage.gm, 'S')} of stage ${second.stage.name}, the stage this capacitor wraps, sets the zero`,
                }
              : undefined,
            req
              ? { range: req.origin.range, message: `required: RHP zeros at or above ${factor} × UGF` }
              : undefined,
          ]),
          badness: (factor * ugf) / zero.hz,
        },
      ];
    },
    ({ worstRun }) => rhpZeroFixes(input, worstRun),
  );

function rhpZeroFixes(input: CheckInput, worstRun: CornerRun): FixSuggestion[] {
  const model = worstRun.model;
  const factor = zeroFactor(model, input.settings.rhpZeroFactor);
  const zero = offendingRhpZero(worstRun.analysis, factor);
  const index = zero ? millerBehindZero(model, zero) : undefined;
  const fixes: (FixSuggestion | undefined)[] = [];
  const meets = (a: DesignAnalysis, run: CornerRun) =>
    a.loop.ugfHz !== undefined && !offendingRhpZero(a, zeroFactor(run.model, input.settings.rhpZeroFactor));
  if (index !== undefined) {
    const nominal = input.source.nominal ?? model;
    const miller = nominal.millers[index] ?? model.millers[index]!;
    const verb = miller.rz === undefined ? 'Add' : 'Set';
    const rzEdit = (v: string) => defined([setOrInsertField(nominal, miller.origin, 'rz', v)]);
    fixes.push(
      solvedFix(input, {
        title: (v) => `${verb} rz = ${v} (moves the zero to infinity)`,
        solve: (engine) => engine.solveRzForZeroAtInfinity(model, index),
        meets,
        prefer: 'nearest',
        unit: 'ohm',
        edits: rzEdit,
        preferred: true,
      }),
      solvedFix(input, {
        title: (v) => `${verb} rz = ${v} (left-half-plane zero on the non-dominant pole)`,
        solve: (engine) => engine.solveRzToCancelPole(model, index),
        meets,
        prefer: 'nearest',
        unit: 'ohm',
        edits: rzEdit,
      }),
    );
    const second = stageAt(model, miller.to);
    const gmField = second ? nominal.stages[second.index]?.origin.fields['gm'] : undefined;
    if (second && gmField) {
      fixes.push(
        solvedFix(input, {
          title: (v) => `Raise gm of stage ${second.stage.name} to ${v} (zero at ${factor} × UGF)`,
          solve: (engine) => engine.solveGmForZero(model, second.index, factor),
          meets,
          prefer: 'up',
          unit: 'S',
          edits: (v) => defined([setValueEdit(nominal, gmField, v)]),
        }),
      );
    }
  }
  if (!requirementOf(model, 'zero')) {
    const line = `require zero >= ${input.settings.rhpZeroFactor} * ugf`;
    fixes.push({
      title: `Add \`${line}\` (the default, stated)`,
      edits: [addRequirementEdit(input.source, model, line)],
    });
  }
  return defined(fixes);
}

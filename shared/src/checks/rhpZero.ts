// Right-half-plane zeros below k·UGF, located on the Miller capacitor that makes them.
import type { DesignAnalysis, Zero } from '../analysis/types';
import { formatHz, formatSi } from '../format/si';
import type { DesignModel } from '../language/model';
import type { CornerRun } from '../report';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { defined, setOrInsertField, solvedFix } from './fixes';
import type { RuleSlack } from './solveKnob';
import { stageGmFixes } from './stageGmFixes';
import { requirementOf, stageAt, judgedAsLoop } from './locate';
import type { FixSuggestion } from './types';

/**
 * What a right-half-plane zero does to the loop: its phase lags like a left-half-plane pole's, −arctan(ω/z),
 * while its magnitude rises like a left-half-plane zero's (GHLM; AH), so it flattens the roll-off, pushes
 * the crossover out and lowers the phase margin.
 */
export const RHP_ZERO_EFFECT =
  'it adds phase lag like a pole while lifting the gain like a zero, which flattens the roll-off and pushes the crossover out';

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
            RHP_ZERO_EFFECT +
            (miller
              ? miller.rz === undefined
                ? `; this Miller capacitor has no nulling resistor (the zero lies near gm/Cc of the stage it wraps${second ? `, ${second.stage.name}` : ''})`
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
    if (second) fixes.push(...stageGmFixes(input, second.index, rhpZeroSlack(input.settings.rhpZeroFactor)));
  }
  return defined(fixes);
}

/** ln(lowest RHP zero / (k · UGF)): ≥ 0 where every right-half-plane zero lies at or above k × UGF. */
export function rhpZeroSlack(fallback: number): RuleSlack {
  const lowest = (run: CornerRun) =>
    run.analysis.zeros.filter((z) => z.rhp && Number.isFinite(z.hz)).sort((a, b) => a.hz - b.hz)[0];
  return {
    slack: (run) => {
      const ugf = run.analysis.loop.ugfHz;
      if (ugf === undefined) return NaN;
      const z = lowest(run);
      return z ? Math.log(z.hz / (zeroFactor(run.model, fallback) * ugf)) : Infinity;
    },
    describe: (run) => {
      const ugf = run.analysis.loop.ugfHz;
      const z = lowest(run);
      return !z
        ? 'no right-half-plane zero'
        : ugf === undefined
          ? `zero at ${formatHz(z.hz)}`
          : `zero at ${+(z.hz / ugf).toPrecision(3)} × UGF`;
    },
  };
}

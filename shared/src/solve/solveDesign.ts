// One solve over a design's free parameters: the least objective (by default the current the design
// draws) that meets every requirement, closed-loop stability and the default margins, in the nominal model
// and every corner. The variables are the literals of the `free` parameters; each candidate is written
// into the design's text, read and analysed again in every corner, so derived values, corners and
// parameters used in several places are accounted for exactly. The search is constrainedSearch; the
// answer is rounded to 3 significant digits in the direction that keeps every constraint met, and
// re-checked.
import { readsTimeResponse } from '../checks/measure';
import { analyzeDesign } from '../analysis/analyzeDesign';
import type { CancelToken } from '../analysis/types';
import type { CheckEngine } from '../checks/context';
import { rerunEdited } from '../checks/fixes';
import { knobsOf, type Knob } from '../checks/knobs';
import { requirementOf } from '../checks/locate';
import { measure } from '../checks/measure';
import { requirementSlack } from '../checks/requirementSlack';
import type { CheckSettings } from '../checks/settings';
import type { TextEditSpec } from '../checks/types';
import type { DesignSource, Param } from '../language/model';
import { constrainedSearch } from '../optimize/constrainedSearch';
import type { CornerRun } from '../report';
import { objectiveOf, type ObjectiveValue } from './objective';

export type SolveStatus = 'met' | 'infeasible' | 'no-free-parameters';

export interface SolvedValue {
  readonly name: string;
  /** The SI unit of the parameter's dimension (`F`, `A`, `ohm`; empty for a plain number). */
  readonly unit: string;
  readonly before: number;
  readonly after: number;
  /** The value as it is written after the solve, in the designer's unit (`1.22 pF`). */
  readonly afterText: string;
  readonly beforeText: string;
  readonly atBound: 'low' | 'high' | null;
}

export interface RequirementOutcome {
  readonly kind: string;
  readonly label: string;
  readonly required: string;
  /** The worst run's measured value (in the requirement's own unit, as `measure` gives it), as text, and its corner. */
  readonly worst: { readonly value?: number; readonly text: string; readonly corner: string };
  readonly met: boolean;
}

export interface DesignSolve {
  readonly design: string;
  readonly status: SolveStatus;
  readonly values: readonly SolvedValue[];
  readonly objective: {
    readonly expression: string;
    readonly unit: string;
    readonly before: number;
    readonly after: number;
  };
  readonly requirements: readonly RequirementOutcome[];
  /** The constraints that limit the objective at the answer (met with little room), or that conflict. */
  readonly binding: readonly string[];
  /** The edits that write the answer: only the free parameters' values. */
  readonly edits: readonly TextEditSpec[];
  /** Why the solve could not run, or what it could not meet. */
  readonly note?: string;
  readonly evaluations: number;
}

interface Variable {
  readonly param: Param;
  readonly knob: Knob;
  readonly low: number;
  readonly high: number;
  /** Logarithmic when both bounds are positive: component values span decades. */
  readonly log: boolean;
}

/** A constraint of the solve: its label for people and its slack (≥ 0 where met) in a set of runs. */
interface Constraint {
  readonly label: string;
  readonly slack: (runs: readonly CornerRun[]) => number;
}

/** A constraint with less room than this (normalised slack) at the answer limits the objective. */
const BINDING = 0.02;

export interface SolveOptions {
  readonly settings: CheckSettings;
  readonly token?: CancelToken;
  /** Analyses allowed (each is one edit of the text analysed in every corner). */
  readonly budget?: number;
}

export function solveDesign(source: DesignSource, options: SolveOptions): DesignSolve {
  const nominal = source.nominal;
  const empty = (note: string, status: SolveStatus = 'no-free-parameters'): DesignSolve => ({
    design: source.name,
    status,
    values: [],
    objective: { expression: '', unit: '', before: NaN, after: NaN },
    requirements: [],
    binding: [],
    edits: [],
    note,
    evaluations: 0,
  });
  if (!nominal) return empty('the design could not be read');
  const variables: Variable[] = [];
  for (const param of nominal.params) {
    if (!param.free) continue;
    const value = param.origin.fields['value'];
    const knob = value && knobsOf(nominal, { ...value, param: param.name }, param.name)[0];
    if (!knob || knob.derived) continue;
    const { low, high } = param.free;
    variables.push({ param, knob, low, high, log: low > 0 && high > low });
  }
  if (!variables.length) return empty('the design has no free parameters');

  // The step response only where a requirement needs it: it is the costliest part of an analysis.
  const timeResponse = nominal.requirements.some(readsTimeResponse);
  const engine: CheckEngine = {
    analyze: (m) => analyzeDesign(m, { step: timeResponse, participation: false }),
    solveRzForZeroAtInfinity: () => ({ ok: false, reason: 'not used by the solve' }),
    solveRzToCancelPole: () => ({ ok: false, reason: 'not used by the solve' }),
  };
  const toValue = (v: Variable, x: number) =>
    v.log ? v.low * (v.high / v.low) ** x : v.low + x * (v.high - v.low);
  const toUnit = (v: Variable, value: number) =>
    v.log ? Math.log(value / v.low) / Math.log(v.high / v.low) : (value - v.low) / (v.high - v.low);
  const editsFor = (values: readonly number[]): TextEditSpec[] =>
    variables.map((v, i) => ({ range: v.knob.range, newText: v.knob.write(values[i]!) }));
  const runsFor = (values: readonly number[]) => rerunEdited(source, editsFor(values), engine);

  const constraints = constraintsOf(source, options.settings);
  const measureAt = (runs: readonly CornerRun[] | undefined) => {
    if (!runs) return { objective: NaN, constraints: constraints.map(() => NaN), runs };
    const objective = objectiveOf(runs.find((r) => r.corner === 'nominal')?.model ?? runs[0]!.model);
    return { objective: objective.value, constraints: constraints.map((c) => c.slack(runs)), runs };
  };

  const before = variables.map((v) => v.knob.value);
  const beforeRuns = runsFor(before);
  const beforeObjective = beforeRuns ? objectiveOf(beforeRuns[0]!.model) : objectiveOf(nominal);
  let evaluations = 0;
  const search = constrainedSearch(
    {
      dimension: variables.length,
      start: variables.map((v, i) => Math.min(1, Math.max(0, toUnit(v, before[i]!)))),
      evaluate: (x) => {
        evaluations++;
        const r = measureAt(runsFor(x.map((xi, i) => toValue(variables[i]!, xi))));
        return { objective: r.objective, constraints: r.constraints };
      },
    },
    {
      budget: options.budget ?? 200 + 80 * variables.length,
      isCancelled: () => options.token?.isCancellationRequested === true,
    },
  );
  const continuous = search.best.x.map((xi, i) => toValue(variables[i]!, xi));
  const rounded = search.feasible
    ? roundKeepingFeasible(variables, continuous, (vals) => {
        evaluations++;
        return measureAt(runsFor(vals));
      })
    : continuous.map((v, i) => clampTo(variables[i]!, round3(v)));
  const final = measureAt(runsFor(rounded));
  const met = final.runs !== undefined && final.constraints.every((c) => c >= 0);
  const status: SolveStatus = met ? 'met' : 'infeasible';
  const binding = constraints
    .map((c, i) => ({ label: c.label, slack: final.constraints[i]! }))
    .filter((c) => (met ? c.slack < BINDING : !(c.slack >= 0)))
    .map((c) => c.label);
  const afterObjective = final.runs ? objectiveOf(final.runs[0]!.model) : beforeObjective;
  return {
    design: source.name,
    status,
    values: variables.map((v, i) => ({
      name: v.param.name,
      unit: v.param.dimension,
      before: before[i]!,
      after: rounded[i]!,
      beforeText: v.knob.write(before[i]!),
      afterText: v.knob.write(rounded[i]!),
      atBound: atBound(v, rounded[i]!),
    })),
    objective: {
      expression: afterObjective.expression,
      unit: afterObjective.unit,
      before: beforeObjective.value,
      after: afterObjective.value,
    },
    requirements: final.runs ? outcomes(final.runs) : [],
    binding,
    edits: editsFor(rounded),
    ...(met
      ? {}
      : {
          note: search.feasible
            ? 'the continuous answer met every constraint, but no 3-digit rounding of it does'
            : `no values within the bounds meet every constraint together; the best compromise is shown, and these fail there: ${binding.join('; ')}`,
        }),
    evaluations,
  };
}

const round3 = (x: number) => Number(x.toPrecision(3));
const clampTo = (v: Variable, x: number) => Math.min(v.high, Math.max(v.low, x));

function atBound(v: Variable, x: number): 'low' | 'high' | null {
  const tol = 1e-3 * Math.max(Math.abs(v.high), Math.abs(v.low));
  if (Math.abs(x - v.low) <= Math.max(tol * 1e-3, 5e-3 * Math.abs(v.low))) return 'low';
  if (Math.abs(x - v.high) <= 5e-3 * Math.abs(v.high)) return 'high';
  return null;
}

/**
 * The 3-significant-digit neighbours of each value (below and above), combined, and the feasible
 * combination with the least objective; one step further out when none holds; the continuous values
 * rounded when still none does.
 */
function roundKeepingFeasible(
  variables: readonly Variable[],
  values: readonly number[],
  evaluate: (vals: readonly number[]) => { objective: number; constraints: readonly number[] },
): number[] {
  const options = values.map((x, i) => {
    const v = variables[i]!;
    if (x === 0) return [0];
    const step = 10 ** (Math.floor(Math.log10(Math.abs(x))) - 2);
    const down = round3(Math.floor(x / step + 1e-9) * step);
    const up = round3(Math.ceil(x / step - 1e-9) * step);
    return [...new Set([down, up].map((c) => clampTo(v, c)))];
  });
  let best: { vals: number[]; objective: number } | undefined;
  const combo = (i: number, acc: number[]) => {
    if (i === options.length) {
      const r = evaluate(acc);
      if (r.constraints.every((c) => c >= 0) && (!best || r.objective < best.objective))
        best = { vals: [...acc], objective: r.objective };
      return;
    }
    for (const c of options[i]!) combo(i + 1, [...acc, c]);
  };
  combo(0, []);
  if (best) return best.vals;
  // No neighbour combination holds (the answer sits on a steep boundary): one more step outwards each way.
  const wider = values.map((x, i) => {
    const v = variables[i]!;
    if (x === 0) return [0];
    const step = 10 ** (Math.floor(Math.log10(Math.abs(x))) - 2);
    const up = round3(Math.ceil(x / step - 1e-9) * step + step);
    const down = round3(Math.floor(x / step + 1e-9) * step - step);
    return [...new Set([down, up].map((c) => clampTo(v, c)))];
  });
  options.splice(0, options.length, ...wider);
  combo(0, []);
  const found = best as { vals: number[] } | undefined;
  return found?.vals ?? values.map((x, i) => clampTo(variables[i]!, round3(x)));
}

/**
 * Every requirement of the design in every run, closed-loop stability in every run, and the default phase
 * and gain margins where the design states none (the thresholds the checks hold a loop to).
 */
function constraintsOf(source: DesignSource, settings: CheckSettings): Constraint[] {
  const nominal = source.nominal!;
  const where = (corner: string) => (corner === 'nominal' ? 'nominal' : `corner ${corner}`);
  const out: Constraint[] = [];
  const corners = ['nominal', ...source.corners.filter((c) => c.model).map((c) => c.name)];
  for (const corner of corners) {
    const inRun = (runs: readonly CornerRun[]) => runs.find((r) => r.corner === corner);
    out.push({
      label: `closed-loop stability (${where(corner)})`,
      slack: (runs) => {
        const v = inRun(runs)?.analysis.stability?.verdict;
        return v === undefined ? NaN : v === 'stable' ? 1 : -1;
      },
    });
    nominal.requirements.forEach((req, index) => {
      out.push({
        label: `${measure(req, emptyAnalysis).label} (${where(corner)})`,
        slack: (runs) => {
          const run = inRun(runs);
          const r = run?.model.requirements[index];
          return run && r ? requirementSlack(r, run.analysis) : NaN;
        },
      });
    });
    if (!requirementOf(nominal, 'pm'))
      out.push({
        label: `phase margin ≥ ${settings.phaseMargin}° by default (${where(corner)})`,
        slack: (runs) => {
          const pm = inRun(runs)?.analysis.loop.phaseMarginDeg;
          return pm === undefined ? NaN : (pm - settings.phaseMargin) / 30;
        },
      });
    if (!requirementOf(nominal, 'gain-margin'))
      out.push({
        label: `gain margin ≥ ${settings.gainMargin} dB by default (${where(corner)})`,
        slack: (runs) => {
          const run = inRun(runs);
          if (!run) return NaN;
          const gm = run.analysis.loop.gainMarginDb;
          return gm === undefined ? 1 : (gm - settings.gainMargin) / 10;
        },
      });
  }
  return out;
}

/** Labels only: `measure` names a requirement without looking at the analysis for its label. */
const emptyAnalysis = {
  poles: [],
  zeros: [],
  dcGain: 0,
  loop: { dcGain: 0, crossings: [], peakingDb: 0 },
  problems: [],
} as const;

/** Each requirement's worst value over the runs and the corner that sets it. */
export function outcomes(runs: readonly CornerRun[]): RequirementOutcome[] {
  const nominal = runs[0]!.model;
  return nominal.requirements.map((req, index) => {
    let worst: { slack: number; value?: number; text: string; corner: string } | undefined;
    let met = true;
    for (const run of runs) {
      const r = run.model.requirements[index];
      if (!r) continue;
      const m = measure(r, run.analysis);
      const slack = requirementSlack(r, run.analysis);
      met &&= m.pass;
      if (!worst || slack < worst.slack)
        worst = {
          slack,
          ...(m.value !== undefined ? { value: m.value } : {}),
          text: m.measured,
          corner: run.corner,
        };
    }
    const m = measure(req, runs[0]!.analysis);
    return {
      kind: req.kind,
      label: m.label,
      required: m.required,
      worst: {
        ...(worst?.value !== undefined ? { value: worst.value } : {}),
        text: worst?.text ?? m.measured,
        corner: worst?.corner ?? 'nominal',
      },
      met,
    };
  });
}

export type { ObjectiveValue };

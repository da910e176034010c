// The panel's sliders for a design's free parameters. A set of slider values is evaluated exactly: the free
// parameters' literals are rewritten in the design's text (as the solve writes them), the text is read and
// analysed again in the nominal model and every corner, so derived values (gm from a bias current) and
// corners follow. Values that cannot be read or analysed are refused with the reason, and the written
// values are shown instead.
import { analyzeDesign } from '../analysis/analyzeDesign';
import { editDesignText } from '../checks/fixes';
import { knobsOf, type Knob } from '../checks/knobs';
import type { TextEditSpec } from '../checks/types';
import { formatSi } from '../format/si';
import { parseDocument } from '../language';
import type { DesignModel, DesignSource, Param } from '../language/model';
import { ANALYSABLE_MAGNITUDE } from '../language/valueRanges';
import type { FreePanel, FreeSlider } from '../protocol/panelData';
import type { CornerRun } from '../report';
import { objectiveOf } from '../solve/objective';
import { outcomes } from '../solve/solveDesign';

interface Variable {
  readonly param: Param;
  readonly knob: Knob;
}

/** The free parameters whose value is one literal (the ones the solve may write), in the order written. */
function variablesOf(model: DesignModel): Variable[] {
  const out: Variable[] = [];
  for (const param of model.params) {
    if (!param.free) continue;
    const value = param.origin.fields['value'];
    const knob = value && knobsOf(model, { ...value, param: param.name }, param.name)[0];
    if (knob && !knob.derived) out.push({ param, knob });
  }
  return out;
}

/** The unit a value is shown in: the parameter's dimension, nothing for a plain number. */
export const sliderUnit = (dimension: string) => (dimension === '1' ? '' : dimension);

/** Why `value` cannot stand for the variable, or undefined when it can. */
function valueProblem(v: Variable, value: number): string | undefined {
  const { name } = v.param;
  const { low, high } = v.param.free!;
  const unit = sliderUnit(v.param.dimension);
  if (!Number.isFinite(value)) return `the value of ${name} from the slider is not a finite number`;
  const slack = 1e-9 * Math.max(Math.abs(low), Math.abs(high));
  if (value < low - slack || value > high + slack)
    return `${name} = ${formatSi(value, unit)} lies outside its bounds ${formatSi(low, unit)} .. ${formatSi(high, unit)}`;
  if (
    value !== 0 &&
    (Math.abs(value) < ANALYSABLE_MAGNITUDE.low || Math.abs(value) > ANALYSABLE_MAGNITUDE.high)
  )
    return `${name} = ${value.toExponential(2)} lies outside the magnitudes a design can hold`;
  return undefined;
}

interface Evaluated {
  readonly runs: CornerRun[];
  readonly values: number[];
}

/** The runs of the design with these values written in, or the reason they cannot be analysed. */
function evaluate(
  source: DesignSource,
  variables: readonly Variable[],
  values: readonly number[],
  edits: readonly TextEditSpec[],
): Evaluated | string {
  const written = variables.every((v, i) => v.knob.value === values[i]);
  let nominal = source.nominal!;
  let corners = source.corners;
  if (!written) {
    const text = editDesignText(source, edits);
    if (text === undefined) return 'the free parameters do not lie inside the design';
    const parsed = parseDocument(text);
    const error = parsed.diagnostics.find((d) => d.severity === 'error');
    const design = parsed.designs[0];
    if (error) return `with these values the design does not read: ${error.message}`;
    if (!design?.nominal) return 'with these values the design does not read';
    nominal = design.nominal;
    corners = design.corners;
  }
  const models = [
    { corner: 'nominal', model: nominal },
    ...corners.flatMap((c) => (c.model ? [{ corner: c.name, model: c.model }] : [])),
  ];
  // The step response only where a requirement needs it, as the solve judges them.
  const step = nominal.requirements.some((r) => r.kind === 'settle');
  const runs = models.map((r) => ({
    ...r,
    analysis: analyzeDesign(r.model, { step, participation: false }),
  }));
  if (!written) {
    const failed = runs.find((r) => r.analysis.problems.length > 0);
    if (failed) {
      const where = failed.corner === 'nominal' ? '' : ` (corner ${failed.corner})`;
      return `with these values the network could not be solved${where}: ${failed.analysis.problems[0]!.message}`;
    }
  }
  return { runs, values: [...values] };
}

/**
 * The free parameters' panel at the values asked for (by name; a missing name keeps its written value),
 * and the nominal model the charts draw. Undefined when the design has no free parameter with a literal
 * value.
 */
export function freePanel(
  source: DesignSource,
  requested?: Readonly<Record<string, number>>,
): { readonly free: FreePanel; readonly model: DesignModel } | undefined {
  const model = source.nominal;
  if (!model) return undefined;
  const variables = variablesOf(model);
  if (!variables.length) return undefined;
  const writtenValues = variables.map((v) => v.knob.value);
  const editsFor = (values: readonly number[]): TextEditSpec[] =>
    variables.map((v, i) => ({ range: v.knob.range, newText: v.knob.write(values[i]!) }));

  const asked = variables.map((v, i) => {
    const r = requested?.[v.param.name];
    return r === undefined ? writtenValues[i]! : r;
  });
  let refused = variables.map((v, i) => valueProblem(v, asked[i]!)).find((p) => p !== undefined);
  let result: Evaluated | string | undefined;
  if (refused === undefined) {
    result = evaluate(source, variables, asked, editsFor(asked));
    if (typeof result === 'string') refused = result;
  }
  if (typeof result !== 'object') result = evaluate(source, variables, writtenValues, []);
  if (typeof result === 'string') return undefined;

  const { runs, values } = result;
  const nominal = runs[0]!.model;
  const objective = objectiveOf(nominal);
  const sliders: FreeSlider[] = variables.map((v, i) => {
    const { low, high } = v.param.free!;
    return {
      name: v.param.name,
      unit: sliderUnit(v.param.dimension),
      low,
      high,
      log: low > 0 && high > low,
      written: writtenValues[i]!,
      value: values[i]!,
    };
  });
  return {
    model: nominal,
    free: {
      sliders,
      requirements: outcomes(runs).map((o) => ({
        label: o.label,
        required: o.required,
        worst: { text: o.worst.text, corner: o.worst.corner },
        met: o.met,
      })),
      objective: { expression: objective.expression, unit: objective.unit, value: objective.value },
      // Only the values moved: a literal left as written keeps its own spelling.
      edits: editsFor(values)
        .filter((_, i) => values[i] !== writtenValues[i])
        .map((e) => ({
          range: {
            start: { line: e.range.start.line, character: e.range.start.character },
            end: { line: e.range.end.line, character: e.range.end.character },
          },
          newText: e.newText,
        })),
      ...(refused !== undefined ? { refused } : {}),
    },
  };
}

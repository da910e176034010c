// Building fixes: solve on the exact model, round to 3 significant digits, re-check the rounded value in
// every run, and only then turn it into an edit of the one value it names.
import type { DesignAnalysis, SynthesisResult } from '../analysis/types';
import { formatSi, roundSignificant } from '../format/si';
import type { DesignModel, DesignSource, FieldOrigin, Origin } from '../language/model';
import type { CornerRun } from '../report';
import type { CheckEngine, CheckInput } from './context';
import type { FixSuggestion, TextEditSpec } from './types';

/**
 * Rounded values to try, best first. `up`: a larger value is the safe side (e.g. more Cc for more phase
 * margin), so after the nearest 3-digit value the next steps above it are tried.
 */
export function roundedCandidates(value: number, prefer: 'up' | 'down' | 'nearest'): number[] {
  if (!(value > 0) || !Number.isFinite(value)) return [];
  const near = roundSignificant(value, 3);
  const step = 10 ** (Math.floor(Math.log10(value)) - 2);
  const up = roundSignificant(Math.ceil(value / step - 1e-9) * step, 3);
  const down = roundSignificant(Math.floor(value / step + 1e-9) * step, 3);
  const list =
    prefer === 'up'
      ? [near, up, roundSignificant(up + step, 3), roundSignificant(up + 2 * step, 3)]
      : prefer === 'down'
        ? [near, down, roundSignificant(down - step, 3), roundSignificant(down - 2 * step, 3)]
        : [near, up, down];
  return [...new Set(list)].filter((v) => v > 0);
}

/** The edit that sets a value: of the parameter when the expression is exactly one parameter. */
export function setValueEdit(
  model: DesignModel,
  value: FieldOrigin,
  newText: string,
): TextEditSpec | undefined {
  if (value.param) {
    const param = model.params.find((p) => p.name === value.param);
    const target = param?.origin.fields['value'];
    return target ? { range: target.range, newText } : undefined;
  }
  return { range: value.range, newText };
}

/** Set `name` when the statement has it, else insert ` name = text` at the statement's end. */
export function setOrInsertField(
  model: DesignModel,
  origin: Origin,
  name: string,
  text: string,
): TextEditSpec | undefined {
  const existing = origin.fields[name];
  if (existing) return setValueEdit(model, existing, text);
  return { range: { start: origin.insertAt, end: origin.insertAt }, newText: ` ${name} = ${text}` };
}

/** Insert a `require` line after the design's last requirement (or before its `end`), same indentation. */
export function addRequirementEdit(source: DesignSource, model: DesignModel, line: string): TextEditSpec {
  const statements = [...model.stages, ...model.loads, ...model.millers, ...model.buffered].map(
    (s) => s.origin,
  );
  const indent = statements.length ? statements[0]!.range.start.character : 2;
  const pad = ' '.repeat(indent);
  const last = model.requirements[model.requirements.length - 1];
  if (last) {
    const at = { line: last.origin.range.start.line + 1, character: 0 };
    return { range: { start: at, end: at }, newText: `${pad}${line}\n` };
  }
  const at = { line: source.range.end.line, character: 0 };
  return { range: { start: at, end: at }, newText: `${pad}${line}\n` };
}

export interface SolvedFixSpec {
  /** `valueText` is the rounded value as it will be written (`1.23 pF`). */
  readonly title: (valueText: string) => string;
  readonly solve: (engine: CheckEngine) => SynthesisResult;
  /** The model with the candidate value in place of the one the fix edits. */
  readonly apply: (engine: CheckEngine, model: DesignModel, value: number) => DesignModel;
  /** Whether the run meets the rule once the value is in place. */
  readonly meets: (analysis: DesignAnalysis, run: CornerRun, value: number) => boolean;
  readonly prefer: 'up' | 'down' | 'nearest';
  readonly unit: 'F' | 'ohm' | 'S';
  readonly edits: (valueText: string) => readonly TextEditSpec[] | undefined;
  readonly preferred?: boolean;
}

/**
 * Solve, round, re-check in every analysed run; undefined when no rounded value meets the rule. Runs when a
 * finding's fixes are first read, after the analysis that found it, so it takes no cancellation token.
 */
export function solvedFix(input: CheckInput, spec: SolvedFixSpec): FixSuggestion | undefined {
  const engine = input.engine;
  if (!engine) return undefined;
  const solved = spec.solve(engine);
  if (!solved.ok) return undefined;
  const runs = input.runs.filter((r) => !r.analysis.problems.length);
  for (const candidate of roundedCandidates(solved.value, spec.prefer)) {
    const ok = runs.every((run) => {
      const analysis = engine.analyze(spec.apply(engine, run.model, candidate));
      return !analysis.problems.length && spec.meets(analysis, run, candidate);
    });
    if (!ok) continue;
    const text = formatSi(candidate, spec.unit);
    const edits = spec.edits(text);
    if (!edits || !edits.length) return undefined;
    return { title: spec.title(text), edits, ...(spec.preferred ? { preferred: true } : {}) };
  }
  return undefined;
}

export function defined<T>(items: readonly (T | undefined)[]): T[] {
  return items.filter((x): x is T => x !== undefined);
}

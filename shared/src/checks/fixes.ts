// Building fixes: solve on the exact model, round to 3 significant digits, re-check the rounded value in
// every run, and only then turn it into an edit of the one value it names.
import type { DesignAnalysis, SynthesisResult } from '../analysis/types';
import { formatSi, roundSignificant } from '../format/si';
import { parseDocument } from '../language';
import type { DesignModel, DesignSource, FieldOrigin, Origin, Requirement } from '../language/model';
import type { SourcePosition } from '../language/source';
import type { CornerRun } from '../report';
import { lineStarts } from '../text/lines';
import type { CheckEngine, CheckInput } from './context';
import { knobsOf } from './knobs';
import { measure } from './measure';
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

/**
 * The edit that sets a value written as a literal, or as a parameter that holds one (the parameter is
 * edited). Undefined for a derived value: an expression the designer wrote is never replaced by a number
 * (a fix changes the literals it is derived from instead; see knobs.ts).
 */
export function setValueEdit(
  model: DesignModel,
  value: FieldOrigin,
  newText: string,
): TextEditSpec | undefined {
  const knobs = knobsOf(model, value, '');
  const own = knobs.length === 1 && !knobs[0]!.derived ? knobs[0] : undefined;
  return own ? { range: own.range, newText } : undefined;
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

export interface SolvedFixSpec {
  /** `valueText` is the rounded value as it will be written (`1.23 pF`). */
  readonly title: (valueText: string) => string;
  readonly solve: (engine: CheckEngine) => SynthesisResult;
  /** Whether a run of the edited design meets the rule; `value` is the rounded value written. */
  readonly meets: (analysis: DesignAnalysis, run: CornerRun, value: number) => boolean;
  readonly prefer: 'up' | 'down' | 'nearest';
  readonly unit: 'F' | 'ohm' | 'S';
  /** The edits that write `valueText`, located in the nominal design's text. */
  readonly edits: (valueText: string) => readonly TextEditSpec[] | undefined;
  readonly preferred?: boolean;
}

/**
 * Solve, round, and re-check: the edits are applied to the design's own text, which is parsed and analysed
 * again in every corner, so a parameter used elsewhere or a corner that overrides the edited value is
 * accounted for exactly. Undefined when no rounded value meets the rule everywhere. Runs when a finding's
 * fixes are first read, after the analysis that found it, so it takes no cancellation token.
 */
export function solvedFix(input: CheckInput, spec: SolvedFixSpec): FixSuggestion | undefined {
  const engine = input.engine;
  if (!engine) return undefined;
  const solved = spec.solve(engine);
  if (!solved.ok) return undefined;
  for (const candidate of roundedCandidates(solved.value, spec.prefer)) {
    const text = formatSi(candidate, spec.unit);
    const edits = spec.edits(text);
    if (!edits || !edits.length) return undefined;
    const runs = rerunEdited(input.source, edits, engine);
    if (!runs || !runs.every((run) => spec.meets(run.analysis, run, candidate))) continue;
    // A fix that meets its own rule but breaks another stated requirement is still offered, because it may
    // be the trade the designer wants, but its title says what it costs.
    const broken = newlyBroken(input.runs, runs);
    const title = broken.length ? `${spec.title(text)} — but ${broken.join('; ')}` : spec.title(text);
    return { title, edits, ...(spec.preferred ? { preferred: true } : {}) };
  }
  return undefined;
}

/** Requirements whose measure a fix's re-analysis can judge (it computes no step response). */
const JUDGED_AFTER_FIX = new Set<Requirement['kind']>([
  'ugf',
  'pm',
  'gain-margin',
  'zero',
  'dc-gain',
  'slew',
]);

/** Stated requirements met in every run before the edit that some run of the edited design fails. */
export function newlyBroken(before: readonly CornerRun[], after: readonly CornerRun[]): string[] {
  const out: string[] = [];
  const reqs = after[0]?.model.requirements ?? [];
  reqs.forEach((req, i) => {
    if (!JUDGED_AFTER_FIX.has(req.kind)) return;
    const metBefore = before.every((run) => {
      const r = run.model.requirements[i];
      return r !== undefined && r.kind === req.kind && measure(r, run.analysis).pass;
    });
    if (!metBefore) return;
    for (const run of after) {
      const r = run.model.requirements[i];
      if (!r) continue;
      const m = measure(r, run.analysis);
      if (!m.pass) {
        const where = run.corner === 'nominal' ? '' : ` in corner ${run.corner}`;
        out.push(`${m.label} becomes ${m.measured}${where} (required ${m.required})`);
        return;
      }
    }
  });
  return out;
}

/** The design's text with `edits` (document positions) applied; undefined when an edit lies outside it. */
export function editDesignText(source: DesignSource, edits: readonly TextEditSpec[]): string | undefined {
  const starts = lineStarts(source.text);
  const origin = source.range.start;
  const offset = (p: SourcePosition): number | undefined => {
    const line = p.line - origin.line;
    const start = starts[line];
    if (line < 0 || start === undefined) return undefined;
    const at = start + p.character - (line === 0 ? origin.character : 0);
    return at >= 0 && at <= source.text.length ? at : undefined;
  };
  const located = edits.map((e) => ({
    from: offset(e.range.start),
    to: offset(e.range.end),
    text: e.newText,
  }));
  if (located.some((e) => e.from === undefined || e.to === undefined || e.to < e.from)) return undefined;
  let out = source.text;
  for (const e of [...located].sort((x, y) => y.from! - x.from!))
    out = out.slice(0, e.from) + e.text + out.slice(e.to);
  return out;
}

/** Every run of the edited design, analysed; undefined when it no longer reads cleanly or cannot be solved. */
export function rerunEdited(
  source: DesignSource,
  edits: readonly TextEditSpec[],
  engine: CheckEngine,
): CornerRun[] | undefined {
  const text = editDesignText(source, edits);
  if (text === undefined) return undefined;
  // The rules of one design scan the same knob values (the scan grid depends only on the knob), so
  // their analyses are shared: kept per engine and design source while its fixes are being solved.
  let byEngine = RERUNS.get(engine);
  if (!byEngine) RERUNS.set(engine, (byEngine = new WeakMap()));
  let memo = byEngine.get(source);
  if (!memo) byEngine.set(source, (memo = new Map()));
  if (memo.has(text)) return memo.get(text);
  const runs = analyzeEditedText(text, engine);
  if (memo.size >= RERUN_MEMO_LIMIT) memo.delete(memo.keys().next().value!);
  memo.set(text, runs);
  return runs;
}

/** Analyses of edited design texts, per engine and design source (dropped with them). */
const RERUNS = new WeakMap<CheckEngine, WeakMap<DesignSource, Map<string, CornerRun[] | undefined>>>();
const RERUN_MEMO_LIMIT = 400;

function analyzeEditedText(text: string, engine: CheckEngine): CornerRun[] | undefined {
  const parsed = parseDocument(text);
  const design = parsed.designs[0];
  if (
    parsed.designs.length !== 1 ||
    !design?.nominal ||
    parsed.diagnostics.some((d) => d.severity === 'error')
  )
    return undefined;
  const models = [
    { corner: 'nominal', model: design.nominal },
    ...design.corners.flatMap((c) => (c.model ? [{ corner: c.name, model: c.model }] : [])),
  ];
  const runs = models.map((r) => ({ ...r, analysis: engine.analyze(r.model) }));
  return runs.every((r) => !r.analysis.problems.length) ? runs : undefined;
}

export function defined<T>(items: readonly (T | undefined)[]): T[] {
  return items.filter((x): x is T => x !== undefined);
}

// The models of every corner of a design at one value of a swept parameter. The reference is the design's
// text with the value written in and parsed again (derived values follow exactly as in a single
// analysis). Parsing is most of a point's cost, so when the parameter only ever appears as a whole value
// (`= cl`, never inside `2 * cl` or another parameter's expression), the value is set directly into the
// slots that name it. That shortcut is taken only after it has been shown to give the same models as the
// text at two values of the range; otherwise every point is parsed.
import { editDesignText } from '../checks/fixes';
import { parseDocument } from '../language';
import type { DesignModel, DesignSource } from '../language/model';
import { writeValue, type SweepSpec } from './sweepDesign';

export type ModelsAt = (value: number) => (DesignModel | undefined)[];

/** How the models at each value are made (`direct`: the verified shortcut; `text`: parsed per value). */
export interface ModelSource {
  readonly way: 'direct' | 'text';
  readonly at: ModelsAt;
}

export function modelSource(source: DesignSource, spec: SweepSpec, corners: readonly string[]): ModelSource {
  const text: ModelsAt = (value) => modelsFromText(source, spec, corners, value);
  const bases = corners.map((c) =>
    c === 'nominal' ? source.nominal : source.corners.find((x) => x.name === c)?.model,
  );
  const direct: ModelsAt = (value) => bases.map((m) => m && withParam(m, spec.param, value));
  // Two values inside the range (not its ends, which a test design may write as they are).
  const probes = [0.31, 0.77].map((t) =>
    spec.scale === 'log' && spec.low > 0 && spec.high > 0
      ? Math.exp(Math.log(spec.low) + t * (Math.log(spec.high) - Math.log(spec.low)))
      : spec.low + t * (spec.high - spec.low),
  );
  const agrees = probes.every((v) => {
    const a = text(v);
    const b = direct(v);
    return a.every((m, i) => (m === undefined) === (b[i] === undefined) && (!m || sameValues(m, b[i])));
  });
  return agrees ? { way: 'direct', at: direct } : { way: 'text', at: text };
}

/** The models of every corner, from the design's text with the value written in (the reference). */
export function modelsFromText(
  source: DesignSource,
  spec: SweepSpec,
  corners: readonly string[],
  value: number,
): (DesignModel | undefined)[] {
  const none = corners.map(() => undefined);
  const literal = writeValue(value, spec.dimension);
  if (literal === undefined) return none;
  const edits = [spec.valueRange, ...spec.cornerOverrides].map((range) => ({ range, newText: literal }));
  const text = editDesignText(source, edits);
  if (text === undefined) return none;
  const parsed = parseDocument(text);
  const design = parsed.designs[0];
  if (!design?.nominal || parsed.diagnostics.some((d) => d.severity === 'error')) return none;
  const models = new Map<string, DesignModel>([['nominal', design.nominal]]);
  for (const c of design.corners) if (c.model) models.set(c.name, c.model);
  return corners.map((corner) => models.get(corner));
}

type Item = { origin?: { fields?: Record<string, { param?: string }> } } & Record<string, unknown>;

/**
 * A copy of the model with the parameter and every value written as exactly that parameter set to
 * `value`. Which slots those are comes from the origins (`FieldOrigin.param`); whether that is the whole
 * story is what the probe in `modelSource` checks.
 */
function withParam(model: DesignModel, param: string, value: number): DesignModel {
  const set = (item: Item): Item => {
    const fields = item.origin?.fields;
    if (!fields) return item;
    let out: Item | undefined;
    for (const [key, f] of Object.entries(fields)) {
      if (f.param !== param || typeof item[key] !== 'number') continue;
      out ??= { ...item };
      out[key] = value;
    }
    return out ?? item;
  };
  const copy: Record<string, unknown> = { ...model };
  for (const [key, v] of Object.entries(model)) {
    if (Array.isArray(v)) copy[key] = v.map((x: unknown) => (isItem(x) ? set(x) : x));
  }
  copy['params'] = model.params.map((p) => (p.name === param ? { ...p, value } : set(p as unknown as Item)));
  const fb = model.feedback;
  if (fb.kind === 'factor' && Object.values(fb.origin?.fields ?? {}).some((f) => f.param === param))
    copy['feedback'] = { ...fb, beta: value };
  return copy as unknown as DesignModel;
}

const isItem = (x: unknown): x is Item => typeof x === 'object' && x !== null && 'origin' in x;

/** Where a value came from is not a value: ranges and origins differ between two texts of one model. */
const SKIPPED = new Set(['origin', 'range', 'nameRange', 'valueRange']);

/** Every number (and word) of two models equal, origins aside. */
function sameValues(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a === 'number' && typeof b === 'number') return Object.is(a, b);
  if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null) return false;
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  const ka = Object.keys(a).filter((k) => !SKIPPED.has(k));
  const kb = Object.keys(b).filter((k) => !SKIPPED.has(k));
  if (ka.length !== kb.length) return false;
  const rb = b as Record<string, unknown>;
  const ra = a as Record<string, unknown>;
  return ka.every((k) => Object.prototype.hasOwnProperty.call(rb, k) && sameValues(ra[k], rb[k]));
}

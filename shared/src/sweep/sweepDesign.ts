// A design swept over one parameter: at each value the design's text is rewritten with the parameter set
// to that value (and every corner's override of it too) and analysed exactly, so derived values follow as
// they would in a single analysis, and a point equals the analysis of that text. Between points, the
// lowest phase and gain margin are searched for near each sampled local minimum, so a narrow dip between
// two samples is found.
import { analyzeDesign } from '../analysis/analyzeDesign';
import type { CancelToken, Complex, DesignAnalysis } from '../analysis/types';
import type { DesignModel, DesignSource, Sweep, SweepScale } from '../language/model';
import type { SourceRange } from '../language/source';
import { brentMin } from '../numeric/roots';
import { modelSource } from './modelsAt';

/** What a sweep varies and how: a `sweep` statement, or one asked for from outside (the terminal). */
export interface SweepSpec {
  readonly param: string;
  readonly dimension: string;
  readonly low: number;
  readonly high: number;
  readonly points: number;
  readonly scale: SweepScale;
  readonly valueRange: SourceRange;
  readonly cornerOverrides: readonly SourceRange[];
}

/** The loop's figures in one run at one value. */
export interface SweepMetrics {
  readonly phaseMarginDeg?: number;
  readonly ugfHz?: number;
  /** Absent when the loop's phase never reaches −180° (unbounded). */
  readonly gainMarginDb?: number;
  readonly loopDcGainDb?: number;
  readonly peakingDb?: number;
  /** From the closed-loop poles; absent when they were not computed. */
  readonly stable?: boolean;
}

export interface SweepRun {
  readonly corner: string;
  readonly model: DesignModel;
  readonly analysis: DesignAnalysis;
}

/** One corner at one value; `runs` per corner in the order of `corners`. */
export interface SweepSample {
  readonly value: number;
  /** Undefined for a corner that does not evaluate at this value (an impossible value, say). */
  readonly runs: readonly (SweepRun | undefined)[];
}

export type MarginQuantity = 'phaseMarginDeg' | 'gainMarginDb';
export const REFINED: readonly MarginQuantity[] = ['phaseMarginDeg', 'gainMarginDb'];

/** The lowest value of a quantity over the range: where, and in which corner. */
export interface SweepExtreme {
  readonly value: number;
  readonly at: number;
  readonly corner: string;
}

export interface LocusSample {
  readonly value: number;
  readonly poles: readonly Complex[];
  readonly zeros: readonly Complex[];
}

export interface SweepResult {
  readonly spec: SweepSpec;
  /** `nominal` first, then each corner that evaluates. */
  readonly corners: readonly string[];
  readonly samples: readonly SweepSample[];
  /** The lowest phase and gain margin per corner (index as `corners`), refined between samples. */
  readonly minima: readonly Partial<Record<MarginQuantity, SweepExtreme>>[];
  /** False when cancelled before every point was analysed. */
  readonly complete: boolean;
  /** Analyses the design at any value (memoised): for finding edges between samples. */
  evaluate(value: number): SweepSample;
}

/** The figures a sweep reports, read from one run's analysis. */
export function metricsOf(a: DesignAnalysis): SweepMetrics {
  if (a.problems.length) return {};
  const l = a.loop;
  return {
    ...(l.phaseMarginDeg !== undefined ? { phaseMarginDeg: l.phaseMarginDeg } : {}),
    ...(l.ugfHz !== undefined ? { ugfHz: l.ugfHz } : {}),
    ...(l.gainMarginDb !== undefined ? { gainMarginDb: l.gainMarginDb } : {}),
    ...(l.dcGain > 0 ? { loopDcGainDb: 20 * Math.log10(l.dcGain) } : {}),
    peakingDb: l.peakingDb,
    ...(a.stability ? { stable: a.stability.verdict === 'stable' } : {}),
  };
}

/** The sweep a statement states, as a spec; undefined when its parameter is not in the model. */
export function specOf(source: DesignSource, s: Sweep): SweepSpec | undefined {
  const { low, high, points, scale } = s;
  return adHocSpec(source, s.param, { low, high, points, scale });
}

/**
 * An ad-hoc sweep of any parameter of the design (the terminal's `--param`): its value's place in the
 * text and each corner's override of it, read from the models. Undefined for an unknown parameter.
 */
export function adHocSpec(
  source: DesignSource,
  param: string,
  range: { low: number; high: number; points?: number; scale?: SweepScale },
): SweepSpec | undefined {
  const own = source.nominal?.params.find((p) => p.name === param);
  const valueRange = own?.origin.fields['value']?.range;
  if (!own || !valueRange) return undefined;
  const cornerOverrides: SourceRange[] = [];
  for (const c of source.corners) {
    const r = c.model?.params.find((p) => p.name === param)?.origin.fields['value']?.range;
    if (r && !sameRange(r, valueRange)) cornerOverrides.push(r);
  }
  const positive = range.low > 0 && range.high > 0;
  return {
    param,
    dimension: own.dimension,
    low: range.low,
    high: range.high,
    points: range.points ?? 61,
    scale: range.scale ?? (positive && range.high / range.low > 10 ? 'log' : 'linear'),
    valueRange,
    cornerOverrides,
  };
}

const sameRange = (a: SourceRange, b: SourceRange) =>
  a.start.line === b.start.line &&
  a.start.character === b.start.character &&
  a.end.line === b.end.line &&
  a.end.character === b.end.character;

/** The units a value of each dimension is written in (SI, no prefix, so the literal reads back exactly). */
const UNIT_OF: Readonly<Record<string, string>> = {
  '1': '',
  ohm: 'ohm',
  S: 'S',
  F: 'F',
  A: 'A',
  V: 'V',
  s: 's',
  Hz: 'Hz',
  'V/s': 'V/s',
  deg: 'deg',
  dB: 'dB',
};

/** The literal for an SI value of a dimension, or undefined for a dimension that has no unit word. */
export function writeValue(value: number, dimension: string): string | undefined {
  const unit = UNIT_OF[dimension];
  if (unit === undefined) return undefined;
  return unit ? `${String(value)} ${unit}` : String(value);
}

/** The sampled values: evenly spaced on the sweep's scale, the ends exact. */
export function sweepValues(spec: SweepSpec): number[] {
  const n = spec.points;
  const out: number[] = [];
  for (let i = 0; i < n; i++)
    out.push(i === 0 ? spec.low : i === n - 1 ? spec.high : valueAt(spec, i / (n - 1)));
  return out;
}

/** The value a fraction t ∈ [0, 1] along the sweep's scale. */
function valueAt(spec: SweepSpec, t: number): number {
  if (spec.scale === 'log')
    return Math.exp(Math.log(spec.low) + t * (Math.log(spec.high) - Math.log(spec.low)));
  return spec.low + t * (spec.high - spec.low);
}

/** Position of a value on the sweep's scale (log → ln x), where the searches between samples work. */
export const toScale = (spec: SweepSpec, x: number) => (spec.scale === 'log' ? Math.log(x) : x);
export const fromScale = (spec: SweepSpec, u: number) => (spec.scale === 'log' ? Math.exp(u) : u);

/** The relative width, on the sweep's scale, to which minima and edges between samples are located. */
const LOCATE_TOLERANCE = 1e-4;

/** A sweep done in one go (see sweepDesignSteps for one that pauses). */
export function sweepDesign(source: DesignSource, spec: SweepSpec, token?: CancelToken): SweepResult {
  const steps = sweepDesignSteps(source, spec, token);
  for (;;) {
    const next = steps.next();
    if (next.done) return next.value;
  }
}

/**
 * The sweep, yielding after each analysed value and each search between values, so that a caller on an
 * event loop (the language server) can let an edit through and stop it there.
 */
export function* sweepDesignSteps(
  source: DesignSource,
  spec: SweepSpec,
  token?: CancelToken,
): Generator<void, SweepResult, void> {
  const corners = ['nominal', ...source.corners.filter((c) => c.model).map((c) => c.name)];
  // Per value: the models of every corner (one parse), and each corner's analysis once it is asked for,
  // so that a search between samples in one corner analyses only that corner.
  const memo = new Map<number, { models: (DesignModel | undefined)[]; runs: (SweepRun | null)[] }>();
  const models = modelSource(source, spec, corners);
  const at = (value: number) => {
    let hit = memo.get(value);
    if (!hit) memo.set(value, (hit = { models: models.at(value), runs: [] }));
    return hit;
  };
  const runAt = (value: number, c: number): SweepRun | undefined => {
    const hit = at(value);
    let run = hit.runs[c];
    if (run === undefined) {
      const model = hit.models[c];
      const analysis = model && analyzeDesign(model, { step: false, participation: false });
      hit.runs[c] = run =
        model && analysis && !analysis.problems.length ? { corner: corners[c]!, model, analysis } : null;
    }
    return run ?? undefined;
  };
  const evaluate = (value: number): SweepSample => ({
    value,
    runs: corners.map((_, c) => runAt(value, c)),
  });
  const samples: SweepSample[] = [];
  let complete = true;
  for (const v of sweepValues(spec)) {
    if (token?.isCancellationRequested) {
      complete = false;
      break;
    }
    samples.push(evaluate(v));
    yield;
  }
  const minima: Partial<Record<MarginQuantity, SweepExtreme>>[] = [];
  for (let c = 0; c < corners.length; c++) {
    const out: Partial<Record<MarginQuantity, SweepExtreme>> = {};
    for (const q of REFINED) {
      if (token?.isCancellationRequested) {
        complete = false;
        break;
      }
      const m = lowest(spec, samples, c, q, corners[c]!, (x) => runAt(x, c));
      if (m) out[q] = m;
      yield;
    }
    minima.push(out);
  }
  return { spec, corners, samples, minima, complete, evaluate };
}

/** A quantity of one corner in a sample. */
export function quantityOf(
  sample: SweepSample,
  corner: number,
  q: keyof SweepMetrics,
): number | boolean | undefined {
  const run = sample.runs[corner];
  return run ? metricsOf(run.analysis)[q] : undefined;
}

function marginAt(sample: SweepSample, corner: number, q: MarginQuantity): number | undefined {
  const v = quantityOf(sample, corner, q);
  return typeof v === 'number' ? v : undefined;
}

/**
 * The lowest value of a margin in one corner: the lowest sample, improved by a search (minimize.ts)
 * between the neighbours of every sampled local minimum (a dip narrower than the spacing shows at least
 * as a local minimum of the samples beside it).
 */
function lowest(
  spec: SweepSpec,
  samples: readonly SweepSample[],
  c: number,
  q: MarginQuantity,
  corner: string,
  runAt: (v: number) => SweepRun | undefined,
): SweepExtreme | undefined {
  const marginOf = (x: number) => {
    const run = runAt(x);
    return run ? metricsOf(run.analysis)[q] : undefined;
  };
  const m = samples.map((s) => marginAt(s, c, q));
  let best: SweepExtreme | undefined;
  const consider = (value: number | undefined, at: number) => {
    if (value !== undefined && (!best || value < best.value)) best = { value, at, corner };
  };
  m.forEach((v, i) => consider(v, samples[i]!.value));
  const width = Math.abs(toScale(spec, spec.high) - toScale(spec, spec.low));
  for (let i = 0; i < m.length; i++) {
    const v = m[i];
    if (v === undefined) continue;
    const left = m[i - 1];
    const right = m[i + 1];
    if ((left !== undefined && left < v) || (right !== undefined && right < v)) continue;
    const a = toScale(spec, samples[Math.max(0, i - 1)]!.value);
    const b = toScale(spec, samples[Math.min(m.length - 1, i + 1)]!.value);
    if (!(b > a)) continue;
    const f = (u: number) => marginOf(fromScale(spec, u)) ?? Infinity;
    const { x: u } = brentMin(f, a, b, width * LOCATE_TOLERANCE);
    const x = fromScale(spec, u);
    consider(marginOf(x), x);
  }
  return best;
}

/** The poles and zeros of one corner along the sweep (for a root-locus chart). */
export function locusOf(result: SweepResult, corner: number): LocusSample[] {
  const out: LocusSample[] = [];
  for (const s of result.samples) {
    const run = s.runs[corner];
    if (run)
      out.push({
        value: s.value,
        poles: run.analysis.poles.map((p) => p.s),
        zeros: run.analysis.zeros.map((z) => z.s),
      });
  }
  return out;
}

// Every requirement must hold over the whole range of a sweep. A finding names the worst value of the
// swept parameter and its corner, and the sub-ranges where the requirement fails, their edges located
// between samples by bisection on the sweep's scale. A closed loop unstable anywhere in the range is an
// error of its own.
import { judge, measure, readsTimeResponse } from '../checks/measure';
import type { Finding } from '../checks/types';
import { formatSi } from '../format/si';
import type { DesignSource, Requirement } from '../language/model';
import type { SourceRange } from '../language/source';
import {
  fromScale,
  metricsOf,
  toScale,
  writeValue,
  type SweepResult,
  type SweepSample,
  type SweepSpec,
} from './sweepDesign';

/** Bisection steps for an edge between two samples: 2⁻¹⁶ of their spacing. */
const EDGE_STEPS = 16;

/** A value of the swept parameter for people: `2.1 mA`. */
export function formatSweptValue(spec: SweepSpec, value: number): string {
  const unit = writeValue(1, spec.dimension)?.replace(/^1 ?/, '') ?? '';
  return unit ? formatSi(value, unit) : String(Number(value.toPrecision(3)));
}

/** A failing stretch of the range, `from` ≤ `to` (equal when only one value fails). */
export interface FailingRange {
  readonly from: number;
  readonly to: number;
}

/**
 * The stretches where `fails` holds, from the samples and any extra values known to matter (the minima
 * found between samples), with each edge between a passing and a failing value bisected.
 */
export function failingRanges(
  result: SweepResult,
  fails: (s: SweepSample) => boolean | undefined,
  extra: readonly number[] = [],
): FailingRange[] {
  const { spec } = result;
  const values = [...new Set([...result.samples.map((s) => s.value), ...extra])].sort((a, b) => a - b);
  const flags = values.map((v) => fails(result.evaluate(v)));
  const edge = (pass: number, fail: number): number => {
    let a = toScale(spec, pass);
    let b = toScale(spec, fail);
    for (let i = 0; i < EDGE_STEPS; i++) {
      const m = (a + b) / 2;
      if (fails(result.evaluate(fromScale(spec, m)))) b = m;
      else a = m;
    }
    return fromScale(spec, b);
  };
  const out: FailingRange[] = [];
  let i = 0;
  while (i < values.length) {
    if (!flags[i]) {
      i++;
      continue;
    }
    let j = i;
    while (j + 1 < values.length && flags[j + 1] !== false) j++;
    // Unevaluable values (undefined) inside a failing stretch do not split it.
    const from = i > 0 && flags[i - 1] === false ? edge(values[i - 1]!, values[i]!) : values[i]!;
    const to =
      j + 1 < values.length && flags[j + 1] === false ? edge(values[j + 1]!, values[j]!) : values[j]!;
    out.push({ from, to });
    i = j + 1;
  }
  return out;
}

/** A requirement the sweep judges, and where over the range it fails in any corner. */
export interface RequirementFailure {
  readonly req: Requirement;
  /** Its place in the model's requirements (each corner's model lists them in the same order). */
  readonly index: number;
  /** Its verdict in one corner at one sample; undefined where that corner does not evaluate. */
  readonly verdict: (
    s: SweepSample,
    c: number,
  ) => { readonly value?: number; readonly pass: boolean } | undefined;
  /** The minima found between samples for this requirement's margin (values that matter besides the samples). */
  readonly extra: readonly number[];
  readonly ranges: readonly FailingRange[];
}

/**
 * Every requirement a sweep judges with its failing stretches (empty where it holds over the whole
 * range): the findings and the panel's shading both read these.
 */
export function requirementFailures(source: DesignSource, result: SweepResult): RequirementFailure[] {
  const nominal = source.nominal;
  if (!nominal) return [];
  const { corners } = result;
  const out: RequirementFailure[] = [];
  nominal.requirements.forEach((req, index) => {
    // A sweep's points have no time response (the costliest part): settling and the load step are
    // judged at the corners only.
    if (readsTimeResponse(req)) return;
    const verdict = (s: SweepSample, c: number) => {
      const run = s.runs[c];
      const r = run?.model.requirements[index];
      return run && r && r.kind === req.kind ? judge(r, run.analysis) : undefined;
    };
    const fails = (s: SweepSample) => {
      let any: boolean | undefined;
      for (let c = 0; c < corners.length; c++) {
        const v = verdict(s, c);
        if (v) any = (any ?? false) || !v.pass;
      }
      return any;
    };
    // The minima found between samples, for the margins they were searched for.
    const q = req.kind === 'pm' ? 'phaseMarginDeg' : req.kind === 'gain-margin' ? 'gainMarginDb' : undefined;
    const extra = q ? result.minima.flatMap((m) => (m[q] ? [m[q].at] : [])) : [];
    out.push({ req, index, verdict, extra, ranges: failingRanges(result, fails, extra) });
  });
  return out;
}

/** Findings of one sweep: one per requirement that fails somewhere in the range, and instability. */
/** `range`: where the findings are shown (the `sweep` line; the design's name for an ad-hoc sweep). */
export function sweepFindings(source: DesignSource, range: SourceRange, result: SweepResult): Finding[] {
  const nominal = source.nominal;
  if (!nominal) return [];
  const { spec, corners } = result;
  const at = (x: number) => `${spec.param} = ${formatSweptValue(spec, x)}`;
  const inCorner = (c: string) => (corners.length > 1 ? ` (corner ${c})` : '');
  const describe = (ranges: readonly FailingRange[]): string => {
    const whole = ranges.length === 1 && ranges[0]!.from === spec.low && ranges[0]!.to === spec.high;
    if (whole) return `; fails over the whole sweep of ${spec.param}`;
    const parts = ranges.map((r) =>
      r.from === r.to
        ? `at ${formatSweptValue(spec, r.from)}`
        : `from ${formatSweptValue(spec, r.from)} to ${formatSweptValue(spec, r.to)}`,
    );
    return `; fails for ${spec.param} ${parts.join(' and ')}`;
  };
  const findings: Finding[] = [];
  const base = {
    design: source.name,
    range,
    fixes: [],
  } as const;

  for (const { req, index, verdict, extra, ranges } of requirementFailures(source, result)) {
    if (!ranges.length) continue;
    // The worst value: lowest for `>=`, highest for `<=`, over samples and minima, in any corner.
    const op = 'op' in req ? req.op : '>=';
    let worst: { x: number; c: number; value?: number } | undefined;
    for (const x of [...result.samples.map((s) => s.value), ...extra]) {
      const s = result.evaluate(x);
      for (let c = 0; c < corners.length; c++) {
        const v = verdict(s, c);
        if (!v || v.pass) continue;
        const worse =
          !worst ||
          (v.value === undefined
            ? worst.value !== undefined
            : worst.value !== undefined && (op === '>=' ? v.value < worst.value : v.value > worst.value));
        if (worse) worst = { x, c, ...(v.value !== undefined ? { value: v.value } : {}) };
      }
    }
    if (!worst) continue;
    const run = result.evaluate(worst.x).runs[worst.c]!;
    const m = measure(run.model.requirements[index]!, run.analysis);
    const required = m.required.replace(/^[≥≤] /, '');
    const head =
      worst.value === undefined
        ? `${m.label} at ${at(worst.x)}${inCorner(corners[worst.c]!)}: ${m.measured}, required ${m.required}`
        : `${m.label} ${m.measured} at ${at(worst.x)}${inCorner(corners[worst.c]!)} is ${op === '>=' ? 'below' : 'above'} the required ${required}`;
    findings.push({
      ...base,
      code: 'sweep',
      severity: 'error',
      message: `${head}${describe(ranges)}.`,
      related: [{ range: req.origin.range, message: 'the requirement' }],
      ...(corners.length > 1 ? { corners: [corners[worst.c]!] } : {}),
    });
  }

  // Instability anywhere is an error whatever the requirements say.
  const unstable = (s: SweepSample) => {
    let any: boolean | undefined;
    for (const run of s.runs) {
      const st = run ? metricsOf(run.analysis).stable : undefined;
      if (st !== undefined) any = (any ?? false) || !st;
    }
    return any;
  };
  const ranges = failingRanges(result, unstable);
  if (ranges.length) {
    const first = result.samples.find((s) => unstable(s)) ?? result.evaluate(ranges[0]!.from);
    const c = first.runs.findIndex((r) => r && metricsOf(r.analysis).stable === false);
    findings.push({
      ...base,
      code: 'sweep',
      severity: 'error',
      message: `The closed loop is unstable at ${at(first.value)}${inCorner(corners[Math.max(c, 0)]!)}${describe(ranges).replace('fails', 'unstable')}.`,
      related: [],
      ...(corners.length > 1 && c >= 0 ? { corners: [corners[c]!] } : {}),
    });
  }
  return findings;
}

// Everything the pole-split panel draws, computed by the engine for one design: the locus of poles and
// zeros against the compensation capacitor (from Cc = 0 to far past the written value), the loop gain, the
// closed-loop step, and the roots with their node participation. Pure; the server calls it per request.
import { hasCompensation, primaryCompensation } from '../analysis/compensation';
import { closedLoopVerdict } from '../format/closedLoop';
import { analyzeDesign, loopResponse, sweepCompensation, withValue } from '../analysis';
import { emptyAnalysis } from '../analysis/analyzeDesign';
import type { CancelToken, Complex, DesignAnalysis, LocusPoint } from '../analysis/types';
import { formatDcGain } from '../format/quantities';
import { formatSi } from '../format/si';
import { ANALYSABLE_MAGNITUDE } from '../language/valueRanges';
import type { DesignModel, DesignSource } from '../language/model';
import { freePanel } from './freeParameters';
import { panelSweeps } from './sweepPanel';
import { panelClosedCircuit, panelLargeSignal } from './circuitResponses';
import {
  CAUTION,
  type CompensationChoice,
  type CompensationTarget,
  type LocusSeries,
  type PanelData,
  type SliderRange,
} from '../protocol/panelData';
import { gainDb } from '../units';
import { modulus, modulusHz } from '../numeric/complex';

export interface PanelOptions {
  /** Slider overrides of the swept compensation element (F, ohm); `rz = 0` removes the nulling resistor. */
  readonly cc?: number;
  readonly rz?: number;
  /** The element to sweep; when absent or not in the design, the one `sweptCompensation` picks. */
  readonly compensation?: CompensationTarget;
  readonly token?: CancelToken;
  /** Settling tolerance when the design states none (fraction). */
  readonly settleTolerance?: number;
  /** Points per decade of the Cc sweep. */
  readonly sweepPerDecade?: number;
  /**
   * The design's source: when it has free parameters, the panel carries their sliders, and `free` (by
   * name, SI) sets their values in the text, which is analysed again (the Cc and Rz overrides then do not
   * apply: those values are free parameters' sliders or follow from them).
   */
  readonly source?: DesignSource;
  readonly free?: Readonly<Record<string, number>>;
}

/** The sweep spans this factor either side of the written Cc, plus the uncompensated point Cc = 0. */
export const SWEEP_SPAN = 100;
const BODE_PER_DECADE = 40;
const BODE_MAX_POINTS = 600;

type Target = CompensationTarget;

export { hasCompensation };

/**
 * The element the sliders move: the requested one when the design has it, else the capacitor that the
 * quick fixes treat as the design's compensation (primaryCompensation: the one into the output first).
 */
export function sweptCompensation(model: DesignModel, requested?: CompensationTarget): Target | undefined {
  if (requested && hasCompensation(model, requested)) return { kind: requested.kind, index: requested.index };
  const primary = primaryCompensation(model);
  return primary ? { kind: primary.kind, index: primary.index } : undefined;
}

/** Every compensation element in the order the selector lists them: Miller capacitors, then buffered. */
export function compensationChoices(model: DesignModel): CompensationChoice[] {
  return [
    ...model.millers.map((m, index) => ({
      kind: 'miller' as const,
      index,
      label: `miller ${m.from} -> ${m.to}`,
    })),
    ...model.buffered.map((b, index) => ({
      kind: 'buffered' as const,
      index,
      label: `indirect ${b.from} -> ${b.to}`,
    })),
  ];
}

/** The element whose statement spans `position`'s line, if any (the cursor on a `miller` line). */
export function compensationAt(
  model: DesignModel,
  position: { readonly line: number; readonly character: number },
): Target | undefined {
  const on = (r: { start: { line: number }; end: { line: number } }) =>
    position.line >= r.start.line && position.line <= r.end.line;
  const m = model.millers.findIndex((x) => on(x.origin.range));
  if (m >= 0) return { kind: 'miller', index: m };
  const b = model.buffered.findIndex((x) => on(x.origin.range));
  if (b >= 0) return { kind: 'buffered', index: b };
  return undefined;
}

export function logSpace(from: number, to: number, perDecade: number): number[] {
  const decades = Math.log10(to / from);
  const n = Math.max(2, Math.round(decades * perDecade) + 1);
  return Array.from({ length: n }, (_, i) => from * 10 ** ((decades * i) / (n - 1)));
}

/** Sweep values: 0, the log-spaced span, and the written and shown values exactly (so markers lie on it). */
export function sweepValues(written: number, shown: number, perDecade: number): number[] {
  const values = [0, ...logSpace(written / SWEEP_SPAN, written * SWEEP_SPAN, perDecade), written, shown];
  const sorted = [...new Set(values)].sort((a, b) => a - b);
  // Drop log points that nearly coincide with an exact value, keeping the exact one.
  return sorted.filter((v, i) => {
    const exact = v === written || v === shown || v === 0;
    if (exact) return true;
    const near = (w: number) => w !== v && Math.abs(w / v - 1) < 1e-6;
    return !near(written) && !near(shown);
  });
}

/** Branch k of a locus: the k-th root by magnitude at each swept value that has at least k+1 roots. */
function branches(
  points: readonly LocusPoint[],
  pick: (p: LocusPoint) => readonly Complex[],
  label: string,
  rhp: boolean,
): LocusSeries[] {
  const sorted = points.map((p) => ({
    value: p.value,
    roots: pick(p)
      .filter((s) => Number.isFinite(s.re) && Number.isFinite(s.im))
      .slice()
      .sort((a, b) => modulus(a) - modulus(b)),
  }));
  const count = Math.max(0, ...sorted.map((p) => p.roots.length));
  const out: LocusSeries[] = [];
  for (let k = 0; k < count; k++) {
    const cc: number[] = [];
    const hz: number[] = [];
    const side: boolean[] = [];
    for (const p of sorted) {
      const s = p.roots[k];
      if (!s || modulus(s) === 0) continue;
      cc.push(p.value);
      hz.push(modulusHz(s));
      side.push(s.re > 0);
    }
    if (cc.length === 0) continue;
    if (!rhp) {
      out.push({ label: `${label} ${k + 1}`, cc, hz });
      continue;
    }
    const half = side.every(Boolean) ? 'RHP ' : side.every((r) => !r) ? 'LHP ' : '';
    out.push({ label: `${half}${label} ${k + 1}`, cc, hz, rhp: side });
  }
  return out;
}

/** A frequency grid a few decades either side of every root and crossing, so the Bode plot shows them all. */
export function bodeGrid(rootsHz: readonly number[]): number[] {
  const f = rootsHz.filter((x) => Number.isFinite(x) && x > 0);
  if (f.length === 0) return logSpace(1, 1e9, BODE_PER_DECADE);
  const lo = Math.min(...f) / 100;
  const hi = Math.max(...f) * 10;
  const perDecade = Math.min(BODE_PER_DECADE, BODE_MAX_POINTS / Math.max(1, Math.log10(hi / lo)));
  return logSpace(lo, hi, perDecade);
}

function sliderRanges(model: DesignModel, target: Target, ccWritten: number, rzWritten: number | undefined) {
  const cc: SliderRange = { min: ccWritten / SWEEP_SPAN, max: ccWritten * SWEEP_SPAN };
  let rz0 = rzWritten;
  if (!(rz0 && rz0 > 0)) {
    // Without a written Rz the interesting span is around 1/gm of the stage the capacitor feeds back from.
    const to = target.kind === 'miller' ? model.millers[target.index]!.to : model.buffered[target.index]!.to;
    const gm =
      model.stages.find((s) => s.name === to)?.gm ?? Math.max(...model.stages.map((s) => s.gm), 1e-3);
    rz0 = 1 / gm;
  }
  const rz: SliderRange = { min: rz0 / SWEEP_SPAN, max: rz0 * SWEEP_SPAN };
  return { cc, rz };
}

/**
 * Why the slider values cannot be shown, or undefined when they can: a value must be finite and within the
 * magnitudes a design may hold (the language's own limit), so that no request reaches the engine with a
 * number it cannot represent.
 */
function sliderProblem(options: PanelOptions): string | undefined {
  // Zero is allowed: for Cc it means "as written", for Rz "no nulling resistor".
  const check = (value: number | undefined, what: 'Cc' | 'Rz') => {
    if (value === undefined) return undefined;
    if (!Number.isFinite(value)) return `the ${what} from the slider is not a finite number`;
    if (value < 0) return `the ${what} from the slider must not be negative`;
    if (value !== 0 && (value < ANALYSABLE_MAGNITUDE.low || value > ANALYSABLE_MAGNITUDE.high)) {
      return (
        `the ${what} from the slider (${formatSi(value, what === 'Cc' ? 'F' : 'ohm')}) lies outside the ` +
        `magnitudes a design can hold (${ANALYSABLE_MAGNITUDE.low} to ${ANALYSABLE_MAGNITUDE.high} in SI units)`
      );
    }
    return undefined;
  };
  return check(options.cc, 'Cc') ?? check(options.rz, 'Rz');
}

/**
 * PanelData for one design. `cc`/`rz` override the swept element as the sliders ask. Returns undefined when
 * the token is cancelled part-way (the caller drops the request).
 */
export function buildPanelData(
  given: DesignModel,
  uri: string,
  panelOptions: PanelOptions = {},
): PanelData | undefined {
  const free = panelOptions.source ? freePanel(panelOptions.source, panelOptions.free) : undefined;
  const model = free?.model ?? given;
  const options: PanelOptions = free ? { ...panelOptions, cc: undefined, rz: undefined } : panelOptions;
  const token = options.token;
  const target = sweptCompensation(model, options.compensation);
  const choices = compensationChoices(model);
  let shown = model;
  let compensation: PanelData['compensation'];
  let ccShown: number | undefined;
  let rzShown: number | undefined;
  // Slider values the engine cannot represent are refused (the sliders stay at the written values).
  const refused = sliderProblem(options);
  const cc = refused === undefined ? options.cc : undefined;
  const rz = refused === undefined ? options.rz : undefined;
  if (target) {
    const written = target.kind === 'miller' ? model.millers[target.index]! : model.buffered[target.index]!;
    const rzWritten = target.kind === 'miller' ? model.millers[target.index]!.rz : undefined;
    const label = choices.find((c) => c.kind === target.kind && c.index === target.index)!.label;
    compensation = { kind: target.kind, index: target.index, ccWritten: written.cc, rzWritten, label };
    if (cc !== undefined && cc > 0) shown = withValue(shown, { ...target, field: 'cc' }, cc);
    if (rz !== undefined && target.kind === 'miller')
      shown = withValue(shown, { ...target, field: 'rz' }, rz);
    ccShown = cc !== undefined && cc > 0 ? cc : written.cc;
    rzShown = target.kind === 'miller' ? (rz ?? rzWritten) : undefined;
  }

  // The design's own settling requirement sets the band; the setting applies only when it states none.
  const stated = model.requirements.find((r) => r.kind === 'settle');
  const settleTolerance = stated?.kind === 'settle' ? stated.tolerance : options.settleTolerance;
  const analysis: DesignAnalysis =
    refused !== undefined
      ? emptyAnalysis([{ message: refused }])
      : analyzeDesign(shown, settleTolerance !== undefined ? { settleTolerance } : {});
  if (token?.isCancellationRequested) return undefined;
  const noStep = {
    t: [],
    y: [],
    final: 0,
    tolerance: settleTolerance ?? 0,
    overshootPct: 0,
    ...(analysis.stepUnavailable !== undefined ? { unavailable: analysis.stepUnavailable } : {}),
  };
  const base = {
    uri,
    design: model.name,
    compensation,
    ...(choices.length > 0 ? { compensationChoices: choices } : {}),
    cc: ccShown,
    rz: rzShown,
    sliders:
      target && compensation
        ? sliderRanges(model, target, compensation.ccWritten, compensation.rzWritten)
        : undefined,
    ...(free ? { free: free.free } : {}),
    caution: CAUTION,
  };
  if (analysis.problems.length > 0) {
    return {
      ...base,
      poles: [],
      zeros: [],
      locus: { poles: [], zeros: [] },
      bode: { hz: [], magDb: [], phaseDeg: [], crossings: [] },
      step: noStep,
      summary: { closedLoop: 'not analyzed', dcGainDb: gainDb(analysis.dcGain) },
      problems: analysis.problems.map((p) =>
        p.node && !p.message.includes(`'${p.node}'`) ? `${p.message} (node ${p.node})` : p.message,
      ),
    };
  }

  let locus: PanelData['locus'] = { poles: [], zeros: [] };
  if (target && compensation && ccShown !== undefined) {
    const values = sweepValues(compensation.ccWritten, ccShown, options.sweepPerDecade ?? 15);
    const points = sweepCompensation(shown, { ...target, field: 'cc' }, values, token);
    if (token?.isCancellationRequested) return undefined;
    locus = {
      poles: branches(points, (p) => p.poles, 'pole', false),
      zeros: branches(points, (p) => p.zeros, 'zero', true),
    };
  }

  const hz = bodeGrid([
    ...analysis.poles.map((p) => p.hz),
    ...analysis.zeros.map((z) => z.hz),
    ...analysis.loop.crossings.map((c) => c.hz),
  ]);
  const response = loopResponse(shown, hz);
  if (token?.isCancellationRequested) return undefined;
  const sweeps = options.source ? panelSweeps(options.source, token) : undefined;
  if (token?.isCancellationRequested) return undefined;

  const step = analysis.step;
  const largeSignal = panelLargeSignal(analysis);
  const closedCircuit = panelClosedCircuit(analysis);
  const stable = analysis.stability ? analysis.stability.verdict === 'stable' : undefined;
  return {
    ...base,
    poles: analysis.poles.map((p) => ({
      s: p.s,
      hz: p.hz,
      damping: p.damping,
      namedAfter: p.namedAfter,
      participation: p.participation,
    })),
    zeros: analysis.zeros.map((z) => ({ s: z.s, hz: z.hz, rhp: z.rhp })),
    ...(analysis.closedLoopPoles
      ? { closedLoopPoles: analysis.closedLoopPoles.map((s) => ({ re: s.re, im: s.im })) }
      : {}),
    locus,
    bode: {
      // A response that could not be computed leaves the chart empty rather than misaligned.
      hz: response.problems ? [] : hz,
      magDb: response.magDb,
      phaseDeg: response.phaseDeg,
      ugfHz: analysis.loop.ugfHz,
      phaseMarginDeg: analysis.loop.phaseMarginDeg,
      crossings: analysis.loop.crossings,
    },
    step: step
      ? {
          t: step.t,
          y: step.y,
          final: step.final,
          tolerance: step.tolerance,
          settlingTime: step.settlingTime,
          overshootPct: step.overshootPct,
          ...(stable !== undefined ? { stable } : {}),
          ...(largeSignal ? { largeSignal } : {}),
        }
      : noStep,
    ...(closedCircuit ? { closedCircuit } : {}),
    summary: {
      closedLoop: closedLoopVerdict(analysis),
      ugfHz: analysis.loop.ugfHz,
      phaseMarginDeg: analysis.loop.phaseMarginDeg,
      gainMarginDb: analysis.loop.gainMarginDb,
      dcGainDb: gainDb(analysis.dcGain),
      dcGainText: formatDcGain(analysis.dcGain),
      slewVperUs: analysis.slew ? analysis.slew.rate / 1e6 : undefined,
    },
    ...(sweeps ? { sweeps } : {}),
    problems: [],
  };
}

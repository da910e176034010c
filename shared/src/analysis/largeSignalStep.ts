// The closed loop's response to an input step of a given size, with each stage's output current limited by
// its bias (analysis/saturatingStages.ts): the stiff nonlinear nodal equations integrated in time.
//
// Unknowns are the network's node voltages y. The input node's voltage is algebraic: with a feedback
// factor it is vin = A − β·σ·v(out) (the loop as core.ts closes it, u = r − β·σ·y); when the design's own
// elements close the loop it is the step itself, vin = A. In charge form, with q(y) = C·y + cIn·vin(y),
//
//     d/dt q(y) = f(y) = −(G·y + gIn·vin(y) + Σ corrections of the saturating stages),
//
// that is M·y' = f(y) with the constant M = C + cIn·(∂vin/∂y)ᵀ, singular when some node has no capacitance
// (its row is algebraic). The charge on every node is continuous across the step (the currents into a node
// are bounded), which gives the state just after it; from there three-stage Radau IIA steps (order 5,
// numeric/radau.ts) with step doubling for the local error: each step is taken whole and as two halves,
// and the halves' result is kept when (halves − whole)/31 is within the tolerance (Richardson's estimate for
// an order-5 method, whose local error scales as h⁶).
import type { Network } from '../circuit/network';
import { buildNetwork } from '../circuit/buildNetwork';
import type { DesignModel } from '../language/model';
import { luFactor, luSolve } from '../numeric/luReal';
import { END_SLOPE, radauStepper, type ImplicitSystem } from '../numeric/radau';
import { brentRoot } from '../numeric/roots';
import { settleToleranceProblem } from './settleTolerance';
import { saturatingStages, stageFraction, type SaturatingStage } from './saturatingStages';
import type { Complex, LargeSignalStep, StepResponse } from './types';

/** How the design's input node is driven during the step. */
export type StepDrive =
  { readonly kind: 'factor'; readonly beta: number; readonly sign: number } | { readonly kind: 'circuit' };

export type LargeSignalOutcome =
  { readonly ok: true; readonly step: LargeSignalStep } | { readonly ok: false; readonly reason: string };

/** A stage delivering more than this fraction of its bias is slewing. */
export const SLEWING_FRACTION = 0.9;
/** Below this fraction of its bias every stage is linear to within 1 % of its gm (1 − tanh² ≥ 0.99). */
const LINEAR_FRACTION = 0.1;
/** The local error allowed per step, relative to the signal's scale (see `errorTolerance`). */
const MAX_RELATIVE_ERROR = 1e-7;
/** …but no finer than double precision resolves a step's error estimate (a difference of two solutions). */
const MIN_RELATIVE_ERROR = 1e-11;
/** Newton's update must be this far below the error tolerance. */
const NEWTON_FRACTION = 1e-3;
/** A bound on the work of one response, far beyond any amplifier's step. */
const MAX_STEPS = 20_000;
/** …and on its span, in small-signal spans. */
const MAX_SPANS = 1e4;
/** The state counts as at its final value within this fraction of the settling band. */
const NEAR_FINAL = 1e-3;
/**
 * At least this many points over the small-signal span, or over the time elapsed when that is longer (a
 * long slew), so that the response can be drawn.
 */
const SAMPLES_PER_SPAN = 20;

/**
 * The local error per step relative to the signal: fine enough that the error at the settling instant,
 * divided by the slope there (tolerance·final/τ at least), moves the settling time by far less than
 * 0.1 % of itself.
 */
const errorTolerance = (tolerance: number) =>
  Math.max(MIN_RELATIVE_ERROR, Math.min(MAX_RELATIVE_ERROR, tolerance * 1e-4));

export interface LargeSignalInput {
  readonly model: DesignModel;
  readonly network: Network;
  readonly drive: StepDrive;
  readonly amplitude: number;
  readonly tolerance: number;
  /** The closed loop's small-signal poles (rad/s): its time scales. */
  readonly closedPoles: readonly Complex[];
  readonly smallSignalSettlingTime?: number;
}

/** The nodal system during the step, with what the judging needs. */
interface StepSystem extends ImplicitSystem {
  readonly stages: readonly SaturatingStage[];
  /** The output as reported (σ·v(out) with a feedback factor). */
  output(y: Float64Array): number;
  /** Each stage's current over its bias. */
  fractions(y: Float64Array): number[];
  /** cIn·A: the charge the step puts on each node's capacitors to the input. */
  readonly inputCharge: Float64Array;
}

function stepSystem(input: LargeSignalInput): StepSystem {
  const { network, drive, amplitude: A } = input;
  const n = network.n;
  const o = network.output;
  // vin(y) = A + dvin·y(o)
  const dvin = drive.kind === 'factor' ? -drive.beta * drive.sign : 0;
  const outSign = drive.kind === 'factor' ? drive.sign : 1;
  const M = Float64Array.from(network.C);
  for (let i = 0; i < n; i++) M[i * n + o] += network.cIn[i]! * dvin;
  const stages = saturatingStages(input.model, network);
  const vin = (y: Float64Array) => A + dvin * y[o]!;
  const at = (t: SaturatingStage['plus'], y: Float64Array) =>
    t === 'ground' ? 0 : t === 'input' ? vin(y) : y[t]!;
  const control = (s: SaturatingStage, y: Float64Array) => at(s.plus, y) - at(s.minus, y);
  const inputCharge = new Float64Array(n);
  for (let i = 0; i < n; i++) inputCharge[i] = network.cIn[i]! * A;
  return {
    n,
    M,
    stages,
    inputCharge,
    output: (y) => outSign * y[o]!,
    fractions: (y) => stages.map((s) => stageFraction(s, control(s, y))),
    f(y, out) {
      const u = vin(y);
      for (let i = 0; i < n; i++) {
        let s = network.gIn[i]! * u;
        for (let k = 0; k < n; k++) s += network.G[i * n + k]! * y[k]!;
        out[i] = -s;
      }
      // The network stamps −sign·gm·v in the row of the stage's node (current leaving); the stage delivers
      // sign·bias·tanh(gm·v/bias) instead.
      for (const s of stages) {
        const v = control(s, y);
        out[s.node]! += s.sign * (s.bias * Math.tanh((s.gm * v) / s.bias) - s.gm * v);
      }
    },
    jacobian(y, out) {
      for (let i = 0; i < n * n; i++) out[i] = -network.G[i]!;
      for (let i = 0; i < n; i++) out[i * n + o]! -= network.gIn[i]! * dvin;
      for (const s of stages) {
        const th = Math.tanh((s.gm * control(s, y)) / s.bias);
        // ∂/∂v of sign·(bias·tanh(gm·v/bias) − gm·v) = −sign·gm·tanh²
        const d = -s.sign * s.gm * th * th;
        const add = (t: SaturatingStage['plus'], w: number) => {
          if (t === 'ground') return;
          if (t === 'input') out[s.node * n + o]! += d * w * dvin;
          else out[s.node * n + t]! += d * w;
        };
        add(s.plus, 1);
        add(s.minus, -1);
      }
    },
  };
}

/**
 * Newton's method on g(y) = 0 with Jacobian `jac`, each step halved until the residual falls (a
 * saturating stage's tanh makes a full step overshoot far from the solution); undefined when it does not
 * converge. Converged when no update exceeds 1e-12 of `scale`.
 */
function newton(
  n: number,
  y0: Float64Array,
  residual: (y: Float64Array, out: Float64Array) => void,
  jac: (y: Float64Array, out: Float64Array) => void,
  scale: Float64Array,
): Float64Array | undefined {
  const y = Float64Array.from(y0);
  const r = new Float64Array(n);
  const trial = new Float64Array(n);
  const rt = new Float64Array(n);
  const J = new Float64Array(n * n);
  const w = new Float64Array(n);
  // The residual's size with the rows weighed alike (charges and currents differ by many decades).
  const size = (res: Float64Array) => {
    let s = 0;
    for (let i = 0; i < n; i++) s += (res[i]! * w[i]!) ** 2;
    return s;
  };
  for (let iter = 0; iter < 100; iter++) {
    residual(y, r);
    jac(y, J);
    for (let i = 0; i < n; i++) {
      let m = 0;
      for (let k = 0; k < n; k++) m = Math.max(m, Math.abs(J[i * n + k]!));
      w[i] = m > 0 ? 1 / m : 1;
      for (let k = 0; k < n; k++) J[i * n + k]! *= w[i]!;
    }
    const lu = luFactor(J, n);
    if (lu.singular) return undefined;
    const dy = luSolve(
      lu,
      r.map((x, i) => -x * w[i]!),
    );
    if (!dy.every(Number.isFinite)) return undefined;
    let worst = 0;
    for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(dy[i]!) / scale[i]!);
    const before = size(r);
    let t = 1;
    for (let halvings = 0; halvings < 30; halvings++, t /= 2) {
      for (let i = 0; i < n; i++) trial[i] = y[i]! + t * dy[i]!;
      residual(trial, rt);
      if (size(rt) < before) break;
    }
    y.set(trial);
    if (worst <= 1e-12) return y;
  }
  return undefined;
}

export function largeSignalStep(input: LargeSignalInput): LargeSignalOutcome {
  const { amplitude: A, tolerance } = input;
  if (!(Number.isFinite(A) && A > 0))
    return { ok: false, reason: 'the step amplitude must be a positive number' };
  const refused = settleToleranceProblem(tolerance);
  if (refused !== undefined) return { ok: false, reason: refused };
  const poles = input.closedPoles;
  if (poles.length === 0 || !poles.every((p) => Number.isFinite(p.re) && Number.isFinite(p.im)))
    return { ok: false, reason: 'the closed loop has no finite poles to set a time scale' };
  if (!poles.every((p) => p.re < 0))
    return { ok: false, reason: 'the closed loop is not stable, so the step never settles' };
  const sys = stepSystem(input);
  const n = sys.n;
  const advance = radauStepper(sys);
  const fastest = Math.max(...poles.map((p) => Math.hypot(p.re, p.im)));
  const slowestDecay = Math.min(...poles.map((p) => -p.re));
  const tail = (Math.log(1 / tolerance) + 6) / slowestDecay;
  const rtol = errorTolerance(tolerance);

  // The final value: the nonlinear equilibrium f(y) = 0, from the linear one.
  const unit = new Float64Array(n).fill(Math.abs(A));
  const linearFinal = linearEquilibrium(input);
  if (!linearFinal) return { ok: false, reason: 'the closed loop has no equilibrium for this step' };
  const finalState = newton(n, linearFinal, (y, out) => negate(sys.f, y, out), negated(sys), unit);
  let yRef = Math.abs(A);
  for (let i = 0; i < n; i++) yRef = Math.max(yRef, Math.abs((finalState ?? linearFinal)[i]!));
  const scaleOf = (y: Float64Array) => {
    const sc = new Float64Array(n);
    for (let i = 0; i < n; i++) sc[i] = rtol * (yRef + Math.abs(y[i]!));
    return sc;
  };

  // Just after the step: charge conservation (q(y) = q(0⁻) = 0) on the charged directions and the algebraic
  // rows satisfied, as the limit of one backward-Euler step of vanishing length.
  const h0 = 1e-9 / fastest;
  const fy = new Float64Array(n);
  const y0 = newton(
    n,
    new Float64Array(n),
    (y, out) => {
      sys.f(y, fy);
      for (let i = 0; i < n; i++) {
        let s = sys.inputCharge[i]! - h0 * fy[i]!;
        for (let k = 0; k < n; k++) s += sys.M[i * n + k]! * y[k]!;
        out[i] = s;
      }
    },
    (y, out) => {
      sys.jacobian(y, out);
      for (let i = 0; i < n * n; i++) out[i] = sys.M[i]! - h0 * out[i]!;
    },
    unit,
  );
  if (!y0) return { ok: false, reason: 'no consistent state after the step was found' };

  const t: number[] = [0];
  const states: Float64Array[] = [y0];
  const y: number[] = [sys.output(y0)];
  const fractions: number[][] = [sys.fractions(y0)];
  let slewRate = 0;
  const slope = (start: Float64Array, stages: readonly Float64Array[], h: number) => {
    let s = END_SLOPE[0]! * sys.output(start);
    for (let j = 0; j < 3; j++) s += END_SLOPE[j + 1]! * sys.output(stages[j]!);
    return Math.abs(s / h);
  };
  const linearSpan = Math.max(tail, input.smallSignalSettlingTime ?? 0);
  const hMax = linearSpan / SAMPLES_PER_SPAN;
  let now = 0;
  let state = y0;
  let h = Math.min(hMax, 1e-3 / fastest);
  let lastNonlinear = 0;
  let stop = linearSpan;
  // The response has ended once the state is this close to the final equilibrium (a thousandth of the
  // band): an asymptotically stable equilibrium keeps it in the band from there on. Without an
  // equilibrium, a linear tail after the last instant a stage was beyond its linear range stands for it.
  const near = NEAR_FINAL * tolerance * yRef;
  const atFinal = (v: Float64Array) =>
    finalState !== undefined && v.every((x, i) => Math.abs(x - finalState[i]!) <= near);
  let ended = false;
  const hMin = 1e-14 / fastest;
  for (let steps = 0; !ended; steps++) {
    // A response that keeps moving (a large-signal oscillation) is cut off: it does not settle.
    if (steps > MAX_STEPS || now > MAX_SPANS * linearSpan) break;
    const sc = scaleOf(state);
    const whole = advance(state, h, sc, NEWTON_FRACTION);
    const first = whole && advance(state, h / 2, sc, NEWTON_FRACTION);
    const second = first && advance(first.y, h / 2, sc, NEWTON_FRACTION);
    if (!whole || !first || !second) {
      h /= 4;
      if (h < hMin) return { ok: false, reason: 'the integration of the step response failed to converge' };
      continue;
    }
    let err = 0;
    for (let i = 0; i < n; i++) {
      const e = (second.y[i]! - whole.y[i]!) / 31 / sc[i]!;
      err += e * e;
    }
    err = Math.sqrt(err / n);
    if (err <= 1) {
      slewRate = Math.max(slewRate, slope(state, first.stages, h / 2), slope(first.y, second.stages, h / 2));
      now += h;
      state = second.y;
      t.push(now);
      states.push(state);
      y.push(sys.output(state));
      const fr = sys.fractions(state);
      fractions.push(fr);
      if (fr.some((x) => Math.abs(x) > LINEAR_FRACTION)) {
        lastNonlinear = now;
        stop = Math.max(stop, lastNonlinear + tail);
      }
      ended = now >= linearSpan && (finalState ? atFinal(state) : now >= stop);
    }
    if (err > 1 && h < hMin)
      return { ok: false, reason: 'the step response cannot be integrated to the accuracy asked' };
    const grow = err === 0 ? 4 : Math.min(4, Math.max(0.2, 0.9 * Math.pow(err, -1 / 6)));
    h = Math.min(Math.max(hMax, now / SAMPLES_PER_SPAN), h * grow);
  }

  // Without a converged equilibrium, the end of the integration (a full linear tail after the last
  // nonlinear instant) stands for it.
  const final = finalState ? sys.output(finalState) : y[y.length - 1]!;
  const settling = ended ? settlingTime(sys, advance, t, y, states, final, tolerance, scaleOf) : undefined;
  // A stage still beyond 90 % of its bias at the equilibrium: the step is beyond the output's range. The
  // last such stage in the text (nearest the output) is the one that runs out; the ones before it saturate
  // on the error it leaves.
  const endFractions = finalState ? sys.fractions(finalState) : [];
  let stuck = -1;
  endFractions.forEach((x, k) => {
    if (Math.abs(x) > SLEWING_FRACTION) stuck = k;
  });
  // Only the slewing before the output settles counts (a stage that stays at its limit at the
  // equilibrium is `saturatedStage`, not slewing).
  const upTo = settling ?? t[t.length - 1]!;
  // The edges of the slewing spans, refined by Brent's method on the integration from the point before.
  const slewEdge = (i: number): number => {
    const start = states[i - 1]!;
    const sc = scaleOf(start);
    const over = (v: Float64Array) => Math.max(0, ...sys.fractions(v).map(Math.abs)) - SLEWING_FRACTION;
    const at = (tau: number): number => {
      if (tau === 0) return over(start);
      const a = advance(start, tau / 2, sc, NEWTON_FRACTION);
      const b = a && advance(a.y, tau / 2, sc, NEWTON_FRACTION);
      return b ? over(b.y) : NaN;
    };
    const h = t[i]! - t[i - 1]!;
    const tau = brentRoot(at, 0, h, over(start), over(states[i]!), h * 1e-9);
    return Number.isFinite(tau) && tau >= 0 && tau <= h ? t[i - 1]! + tau : NaN;
  };
  const slewing = slewingSpans(t, fractions, sys.stages.length, upTo, slewEdge);
  const dir = final >= 0 ? 1 : -1;
  let peak = 0;
  for (const v of y) peak = Math.max(peak, dir * (v - final));
  const overshootPct = final !== 0 ? (100 * peak) / Math.abs(final) : 0;
  return {
    ok: true,
    step: {
      amplitude: A,
      tolerance,
      samples: { t, y },
      final,
      ...(settling !== undefined ? { settlingTime: settling } : {}),
      ...(input.smallSignalSettlingTime !== undefined
        ? { smallSignalSettlingTime: input.smallSignalSettlingTime }
        : {}),
      slewingTime: slewing.spans.reduce((s, x) => s + (x.end - x.start), 0),
      slewing: slewing.spans,
      slewRateReached: slewRate,
      overshootPct,
      ...(slewing.limiting !== undefined ? { limitingStage: sys.stages[slewing.limiting]!.name } : {}),
      ...(stuck >= 0 ? { saturatedStage: sys.stages[stuck]!.name } : {}),
    },
  };
}

/** The linear closed loop's equilibrium (every stage at gm·v): (G + gIn·∂vin/∂y)·y = −gIn·A. */
function linearEquilibrium(input: LargeSignalInput): Float64Array | undefined {
  const { network, drive, amplitude: A } = input;
  const n = network.n;
  const dvin = drive.kind === 'factor' ? -drive.beta * drive.sign : 0;
  const G = Float64Array.from(network.G);
  for (let i = 0; i < n; i++) G[i * n + network.output]! += network.gIn[i]! * dvin;
  const lu = luFactor(G, n);
  if (lu.singular) return undefined;
  const x = luSolve(
    lu,
    network.gIn.map((g) => -g * A),
  );
  return x.every(Number.isFinite) ? x : undefined;
}

/** The Jacobian of −f. */
function negated(sys: StepSystem) {
  return (y: Float64Array, out: Float64Array) => {
    sys.jacobian(y, out);
    for (let i = 0; i < out.length; i++) out[i] = -out[i]!;
  };
}

function negate(f: (y: Float64Array, out: Float64Array) => void, y: Float64Array, out: Float64Array): void {
  f(y, out);
  for (let i = 0; i < out.length; i++) out[i] = -out[i]!;
}

/**
 * The last sampled time outside ±tolerance·|final|, refined by Brent's method on the integration itself
 * from that sample (two half steps, as accurate as the accepted steps).
 */
function settlingTime(
  sys: StepSystem,
  advance: ReturnType<typeof radauStepper>,
  t: number[],
  y: number[],
  states: Float64Array[],
  final: number,
  tolerance: number,
  scaleOf: (y: Float64Array) => Float64Array,
): number | undefined {
  const band = tolerance * Math.abs(final);
  let last = -1;
  for (let i = 0; i < y.length; i++) if (Math.abs(y[i]! - final) > band) last = i;
  if (last === -1) return 0;
  if (last === y.length - 1) return undefined;
  const start = states[last]!;
  const sc = scaleOf(start);
  const at = (tau: number): number => {
    if (tau === 0) return y[last]!;
    const a = advance(start, tau / 2, sc, NEWTON_FRACTION);
    const b = a && advance(a.y, tau / 2, sc, NEWTON_FRACTION);
    return b ? sys.output(b.y) : NaN;
  };
  const h = t[last + 1]! - t[last]!;
  const err = (tau: number) => Math.abs(at(tau) - final) - band;
  const e0 = err(0);
  const eh = Math.abs(y[last + 1]! - final) - band;
  const tau = brentRoot(err, 0, h, e0, eh, h * 1e-9);
  return Number.isFinite(tau) && tau >= 0 && tau <= h ? t[last]! + tau : t[last + 1];
}

/**
 * The spans before `upTo` during which some stage delivers more than SLEWING_FRACTION of its bias (edges by
 * `refined`, else interpolated linearly between samples), and the stage that spends the longest time there
 * (by interpolated edges: it only picks the stage).
 */
function slewingSpans(
  t: readonly number[],
  fractions: readonly number[][],
  count: number,
  upTo: number,
  refined: (i: number) => number,
): { spans: { start: number; end: number }[]; limiting?: number } {
  const over = (k: number | undefined) => (i: number) =>
    k === undefined
      ? Math.max(0, ...fractions[i]!.map(Math.abs)) - SLEWING_FRACTION
      : Math.abs(fractions[i]![k]!) - SLEWING_FRACTION;
  const spansOf = (g: (i: number) => number, refine?: (i: number) => number) => {
    const spans: { start: number; end: number }[] = [];
    let open: number | undefined;
    const edge = (i: number) => {
      const r = refine?.(i);
      if (r !== undefined && Number.isFinite(r)) return r;
      const a = g(i - 1);
      const b = g(i);
      return t[i - 1]! + ((t[i]! - t[i - 1]!) * a) / (a - b);
    };
    for (let i = 0; i < t.length; i++) {
      const inside = g(i) > 0;
      if (inside && open === undefined) open = i === 0 ? 0 : edge(i);
      else if (!inside && open !== undefined) {
        spans.push({ start: open, end: edge(i) });
        open = undefined;
      }
    }
    if (open !== undefined) spans.push({ start: open, end: t[t.length - 1]! });
    return spans.map((x) => ({ start: x.start, end: Math.min(x.end, upTo) })).filter((x) => x.end > x.start);
  };
  const spans = spansOf(over(undefined), refined);
  let limiting: number | undefined;
  let longest = 0;
  for (let k = 0; k < count; k++) {
    const time = spansOf(over(k)).reduce((s, x) => s + (x.end - x.start), 0);
    if (time > longest) {
      longest = time;
      limiting = k;
    }
  }
  return { spans, ...(limiting !== undefined ? { limiting } : {}) };
}

/**
 * The large-signal step a design's `settle … step` requirement asks for (the first such requirement), for
 * `assemble`: nothing when no requirement states a step.
 */
export function largeSignalFields(
  model: DesignModel,
  network: Network,
  drive: StepDrive,
  closedPoles: readonly Complex[],
  small: StepResponse | undefined,
): { largeSignalStep?: LargeSignalStep; largeSignalStepUnavailable?: string } {
  const req = model.requirements.find((r) => r.kind === 'settle' && r.step !== undefined);
  if (!req || req.kind !== 'settle' || req.step === undefined) return {};
  const smallSignalSettlingTime = small?.tolerance === req.tolerance ? small.settlingTime : undefined;
  // The step must never cost the rest of the analysis: an unexpected failure becomes its reason.
  let outcome: LargeSignalOutcome;
  try {
    outcome = largeSignalStep({
      model,
      network,
      drive,
      amplitude: req.step,
      tolerance: req.tolerance,
      closedPoles,
      ...(smallSignalSettlingTime !== undefined ? { smallSignalSettlingTime } : {}),
    });
  } catch (err) {
    outcome = {
      ok: false,
      reason: `the large-signal step failed: ${err instanceof Error ? err.message : String(err)}`,
    };
  }
  return outcome.ok ? { largeSignalStep: outcome.step } : { largeSignalStepUnavailable: outcome.reason };
}

/**
 * The same for a loop closed by the design's own elements (`feedback at NODE`): the whole circuit with `in`
 * driven by the step, vin = A, and the output as it is (no sign normalisation). `closedPoles` are the
 * circuit's own poles.
 */
export function largeSignalFieldsOfCircuit(
  model: DesignModel,
  closedPoles: readonly Complex[],
  small: StepResponse | undefined,
): { largeSignalStep?: LargeSignalStep; largeSignalStepUnavailable?: string } {
  if (!model.requirements.some((r) => r.kind === 'settle' && r.step !== undefined)) return {};
  const built = buildNetwork(model, { kind: 'input' });
  if (!built.ok) return { largeSignalStepUnavailable: built.problems[0]?.message ?? 'no network' };
  return largeSignalFields(model, built.network, { kind: 'circuit' }, closedPoles, small);
}

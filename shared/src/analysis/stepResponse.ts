// Exact step response of a state-space system: x(t+Δ) = e^(AΔ)·x(t) + (∫₀^Δ e^(Aτ)dτ)·b, both from the
// exponential of the augmented matrix [[A, b], [0, 0]]·Δ. Stable for any step and exact for repeated
// poles. Time constants spread over decades, so the time axis is a few geometric ranges, each with its own
// exact step.
import type { Complex, StepResponse } from './types';
import { expm } from '../numeric/expm';
import { OutOfRangeError } from '../numeric/rangeError';
import { brentMax, brentRoot } from '../numeric/roots';
import { settleToleranceProblem } from './settleTolerance';

export interface StepSystem {
  readonly order: number;
  readonly A: Float64Array;
  readonly b: Float64Array;
  readonly c: Float64Array;
  readonly d: number;
}

/** The step response, or why it could not be computed (in words for the designer). */
export type StepOutcome =
  { readonly ok: true; readonly step: StepResponse } | { readonly ok: false; readonly reason: string };

const STEPS_PER_RANGE = 40;
/**
 * Each range is ten times longer than the one before, so this many ranges cover time constants spread
 * over as many decades: far beyond any amplifier (a few decades between the dominant and the fastest
 * pole), and it bounds the loop that builds the time axis.
 */
const MAX_RANGES = 40;

/** Propagator over Δ: returns Φ (n×n) and Γ (n). Throws OutOfRangeError when A·Δ leaves double range. */
function propagator(sys: StepSystem, dt: number): { phi: Float64Array; gamma: Float64Array } {
  const n = sys.order;
  const m = n + 1;
  const aug = new Float64Array(m * m);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) aug[i * m + j] = sys.A[i * n + j] * dt;
    aug[i * m + n] = sys.b[i] * dt;
  }
  const e = expm(aug, m);
  const phi = new Float64Array(n * n);
  const gamma = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) phi[i * n + j] = e[i * m + j];
    gamma[i] = e[i * m + n];
  }
  return { phi, gamma };
}

function advance(phi: Float64Array, gamma: Float64Array, x: Float64Array, n: number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = gamma[i];
    for (let j = 0; j < n; j++) s += phi[i * n + j] * x[j];
    out[i] = s;
  }
  return out;
}

function outputOf(sys: StepSystem, x: Float64Array): number {
  let y = sys.d;
  for (let i = 0; i < sys.order; i++) y += sys.c[i] * x[i];
  return y;
}

const allFinite = (a: ArrayLike<number>) => {
  for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i])) return false;
  return true;
};

/**
 * Half-width of the settling band: `tolerance` of the final value. A response whose final value is zero
 * (a high-pass: DC is blocked) settles back to zero, so its band is measured against the largest
 * excursion instead.
 */
export function settleBand(y: readonly number[], final: number, tolerance: number): number {
  if (final !== 0) return tolerance * Math.abs(final);
  let peak = 0;
  for (const v of y) peak = Math.max(peak, Math.abs(v));
  return tolerance * peak;
}

/**
 * `tolerance` of the largest excursion from 0: the refined extreme, every sample, and the final value (the
 * supremum of a monotone response, approached but never sampled).
 */
function excursionBand(y: readonly number[], peak: number, final: number, tolerance: number): number {
  let m = Math.max(Math.abs(peak), Math.abs(final));
  for (const v of y) m = Math.max(m, Math.abs(v));
  return tolerance * m;
}

/** The fraction of the final value (or of the largest excursion) a stable response may end away from it. */
const LOST_ACCURACY = 0.1;
const LOST =
  'the step response lost its accuracy to roundoff (values in the network lie too many decades apart to ' +
  'propagate in time)';

const OVERFLOW =
  'the step response leaves the range of double precision (a value in the network is too extreme to ' +
  'propagate in time)';

/**
 * Unit-step response of `sys` whose poles are `poles` and whose DC value is `final` (pass NaN when the
 * system is unstable: the response is then drawn over a few time constants and never settles). Never
 * throws and always returns in bounded time: a tolerance the settling time cannot be judged for, or a
 * system outside double precision, comes back as a reason.
 */
export function stepResponse(
  sys: StepSystem,
  poles: readonly Complex[],
  final: number,
  tolerance: number,
  /**
   * What the settling band is a fraction of: the final value (a step response), or the largest excursion
   * (a disturbance that the loop pulls back, such as a load step, whose final value may be nearly 0).
   */
  bandOf: 'final' | 'excursion' = 'final',
): StepOutcome {
  const refused = settleToleranceProblem(tolerance);
  if (refused !== undefined) return { ok: false, reason: refused };
  const n = sys.order;
  if (!allFinite(sys.A) || !allFinite(sys.b) || !allFinite(sys.c) || !Number.isFinite(sys.d)) {
    return { ok: false, reason: 'the closed loop has a coefficient outside double precision' };
  }
  if (n === 0) {
    return {
      ok: true,
      step: { t: [0], y: [sys.d], final: sys.d, overshootPct: 0, settlingTime: 0, tolerance },
    };
  }
  if (!poles.every((p) => Number.isFinite(p.re) && Number.isFinite(p.im))) {
    return { ok: false, reason: 'a closed-loop pole lies outside double precision' };
  }
  const mags = poles.map((p) => Math.hypot(p.re, p.im)).filter((m) => m > 0);
  if (mags.length === 0) {
    return { ok: false, reason: 'every closed-loop pole is at the origin: the response has no time scale' };
  }
  const fastest = Math.max(...mags);
  const stable = Number.isFinite(final) && poles.every((p) => p.re < 0);
  const slowestDecay = stable ? Math.min(...poles.map((p) => -p.re)) : Math.min(...mags);
  const tEnd = stable ? (Math.log(1 / tolerance) + 6) / slowestDecay : 10 / slowestDecay;
  let span = Math.min(10 / fastest, tEnd);
  const ranges = Math.ceil(Math.log10(tEnd / span)) + 1;
  if (!(span > 0) || !Number.isFinite(tEnd) || !(ranges <= MAX_RANGES)) {
    return {
      ok: false,
      reason:
        `the closed-loop time constants span more than ${MAX_RANGES} decades, too wide to draw the ` +
        'step response on one time axis',
    };
  }
  try {
    const t: number[] = [0];
    const states: Float64Array[] = [new Float64Array(n)];
    let x = states[0];
    let now = 0;
    const y: number[] = [outputOf(sys, x)];
    grow: for (let range = 0; range < ranges && now < tEnd * (1 - 1e-12); range++) {
      const end = range === ranges - 1 ? tEnd : Math.min(span, tEnd);
      const dt = (end - now) / STEPS_PER_RANGE;
      let prop;
      try {
        prop = propagator(sys, dt);
      } catch (err) {
        // An unstable response is drawn until it outgrows double precision.
        if (!stable && err instanceof OutOfRangeError && t.length > 1) break grow;
        throw err;
      }
      for (let k = 0; k < STEPS_PER_RANGE; k++) {
        const next = advance(prop.phi, prop.gamma, x, n);
        const out = outputOf(sys, next);
        if (!allFinite(next) || !Number.isFinite(out)) {
          if (!stable && t.length > 1) break grow;
          throw new OutOfRangeError('the propagated state overflows');
        }
        x = next;
        now += dt;
        t.push(now);
        states.push(x);
        y.push(out);
      }
      now = end;
      span *= 10;
    }
    if (!stable) {
      return {
        ok: true,
        step: { t, y, final: Number.isFinite(final) ? final : y[y.length - 1], overshootPct: 0, tolerance },
      };
    }
    // A stable response ends e^−6·tolerance of its slowest mode from the final value; one that ends far
    // from it was lost to roundoff (capacitances or conductances too many decades apart to propagate).
    const endError = Math.abs(y[y.length - 1] - final);
    if (!(endError <= LOST_ACCURACY * Math.max(Math.abs(final), settleBand(y, final, 1)))) {
      return { ok: false, reason: LOST };
    }
    return { ok: true, step: judge(sys, t, y, states, final, tolerance, bandOf) };
  } catch (err) {
    if (err instanceof OutOfRangeError) return { ok: false, reason: OVERFLOW };
    throw err;
  }
}

/** Overshoot and settling time of a stable response sampled at (t, y) with states `states`. */
function judge(
  sys: StepSystem,
  t: number[],
  y: number[],
  states: Float64Array[],
  final: number,
  tolerance: number,
  bandOf: 'final' | 'excursion',
): StepResponse {
  const n = sys.order;
  const yAt = (i: number, tau: number) => {
    if (tau === 0) return y[i];
    const { phi, gamma } = propagator(sys, tau);
    return outputOf(sys, advance(phi, gamma, states[i], n));
  };
  // Overshoot: the grid maximum refined on the exact propagation around it.
  const dir = final >= 0 ? 1 : -1;
  let peak = 1;
  for (let i = 2; i < y.length; i++) if (dir * y[i] > dir * y[peak]) peak = i;
  let peakValue = y[peak];
  if (peak > 0 && peak + 1 < y.length) {
    const h = t[peak + 1] - t[peak - 1];
    // Each evaluation is an exact propagation (a matrix exponential): Brent's parabolic steps need a
    // fraction of golden section's. The value is flat to second order at the peak, so the time to 1e-7 of
    // the step gives the overshoot to about 1e-14.
    const g = brentMax((tau) => dir * yAt(peak - 1, tau), 0, h, 1e-7, 80);
    if (Number.isFinite(g.value)) peakValue = Math.max(dir * peakValue, g.value) * dir;
  }
  const overshootPct = final !== 0 ? Math.max(0, (100 * dir * (peakValue - final)) / Math.abs(final)) : 0;
  // Settling: the last grid time outside the band, refined between it and the next point.
  const band =
    bandOf === 'final' ? settleBand(y, final, tolerance) : excursionBand(y, peakValue, final, tolerance);
  let last = -1;
  for (let i = 0; i < y.length; i++) if (Math.abs(y[i] - final) > band) last = i;
  let settlingTime: number | undefined;
  if (last === -1) settlingTime = 0;
  else if (last < y.length - 1) {
    const h = t[last + 1] - t[last];
    const err = (tau: number) => Math.abs(yAt(last, tau) - final) - band;
    const tau = brentRoot(err, 0, h, err(0), err(h), h * 1e-9);
    // A refinement that lost its bracket to roundoff falls back to the grid point after the crossing.
    settlingTime = Number.isFinite(tau) && tau >= 0 && tau <= h ? t[last] + tau : t[last + 1];
  }
  return {
    t,
    y,
    final,
    overshootPct: Number.isFinite(overshootPct) ? overshootPct : 0,
    settlingTime,
    tolerance,
    peak: peakValue,
  };
}

// Exact step response of a state-space system: x(t+Δ) = e^(AΔ)·x(t) + (∫₀^Δ e^(Aτ)dτ)·b, both from the
// exponential of the augmented matrix [[A, b], [0, 0]]·Δ. Stable for any step and exact for repeated
// poles. Time constants spread over decades, so the time axis is a few geometric ranges, each with its own
// exact step.
import type { Complex, StepResponse } from './types';
import { expm } from '../numeric/expm';
import { brentRoot, goldenMax } from '../numeric/roots';

export interface StepSystem {
  readonly order: number;
  readonly A: Float64Array;
  readonly b: Float64Array;
  readonly c: Float64Array;
  readonly d: number;
}

const STEPS_PER_RANGE = 40;

/** Propagator over Δ: returns Φ (n×n) and Γ (n). */
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

/**
 * Unit-step response of `sys` whose poles are `poles` and whose DC value is `final` (pass NaN when the
 * system is unstable: the response is then drawn over a few time constants and never settles).
 */
export function stepResponse(
  sys: StepSystem,
  poles: readonly Complex[],
  final: number,
  tolerance: number,
): StepResponse {
  const n = sys.order;
  if (n === 0) {
    return { t: [0], y: [sys.d], final: sys.d, overshootPct: 0, settlingTime: 0, tolerance };
  }
  const mags = poles.map((p) => Math.hypot(p.re, p.im)).filter((m) => m > 0);
  const fastest = Math.max(...mags);
  const stable = Number.isFinite(final) && poles.every((p) => p.re < 0);
  const slowestDecay = stable ? Math.min(...poles.map((p) => -p.re)) : Math.min(...mags);
  const tEnd = stable ? (Math.log(1 / tolerance) + 6) / slowestDecay : 10 / slowestDecay;
  let span = Math.min(10 / fastest, tEnd);
  const t: number[] = [0];
  const states: Float64Array[] = [new Float64Array(n)];
  let x = states[0];
  let now = 0;
  const y: number[] = [outputOf(sys, x)];
  while (now < tEnd * (1 - 1e-12)) {
    const end = Math.min(span, tEnd);
    const dt = (end - now) / STEPS_PER_RANGE;
    const { phi, gamma } = propagator(sys, dt);
    for (let k = 0; k < STEPS_PER_RANGE; k++) {
      x = advance(phi, gamma, x, n);
      now += dt;
      t.push(now);
      states.push(x);
      y.push(outputOf(sys, x));
    }
    now = end;
    span *= 10;
  }
  if (!stable) {
    return { t, y, final: Number.isFinite(final) ? final : y[y.length - 1], overshootPct: 0, tolerance };
  }
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
    const g = goldenMax((tau) => dir * yAt(peak - 1, tau), 0, h, 1e-10, 80);
    peakValue = Math.max(dir * peakValue, g.value) * dir;
  }
  const overshootPct = final !== 0 ? Math.max(0, (100 * dir * (peakValue - final)) / Math.abs(final)) : 0;
  // Settling: the last grid time outside the band, refined between it and the next point.
  const band = tolerance * Math.abs(final);
  let last = -1;
  for (let i = 0; i < y.length; i++) if (Math.abs(y[i] - final) > band) last = i;
  let settlingTime: number | undefined;
  if (last === -1) settlingTime = 0;
  else if (last < y.length - 1) {
    const h = t[last + 1] - t[last];
    const err = (tau: number) => Math.abs(yAt(last, tau) - final) - band;
    const tau = brentRoot(err, 0, h, err(0), err(h), h * 1e-9);
    settlingTime = t[last] + tau;
  }
  return { t, y, final, overshootPct, settlingTime, tolerance };
}

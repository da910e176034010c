// Frequency responses: a direct complex solve of the nodal equations, and the same from the pole/zero/gain
// form. The two are independent routes to one number and must agree.
import type { Network } from '../circuit/network';
import type { Complex } from './types';
import { complexLuFactor, complexLuSolve } from '../numeric/complexLu';

export interface PoleZeroForm {
  readonly poles: readonly Complex[];
  readonly zeros: readonly Complex[];
  readonly k: number;
}

/** Enough to follow a 30-level bisection down to every jump between two samples. */
const MAX_SPLITS_PER_SAMPLE = 256;

export interface Bode {
  readonly magDb: number[];
  readonly phaseDeg: number[];
}

/** A(jω) of the network by solving (G + jωC)·v = −(gIn + jω·cIn). */
export function nodalResponse(net: Network, omega: number): [number, number] {
  const { n, G, C, gIn, cIn, output } = net;
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  for (let i = 0; i < n * n; i++) {
    re[i] = G[i];
    im[i] = omega * C[i];
  }
  const bRe = new Float64Array(n);
  const bIm = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    bRe[i] = -gIn[i];
    bIm[i] = -omega * cIn[i];
  }
  const [xr, xi] = complexLuSolve(complexLuFactor(re, im, n), bRe, bIm);
  return [xr[output], xi[output]];
}

/** arg(jω − a), on a branch that is continuous in ω for any a off the imaginary axis. */
export function continuousArg(a: Complex, omega: number): number {
  const t = Math.atan2(omega - a.im, -a.re);
  return a.re > 0 && t < 0 ? t + 2 * Math.PI : t;
}

/** |H(jω)|² from the pole/zero/gain form: one product, no logarithm per root. */
export function magnitudeSquared(pz: PoleZeroForm, omega: number): number {
  let m = pz.k * pz.k;
  for (const z of pz.zeros) {
    const dr = z.re;
    const di = omega - z.im;
    m *= dr * dr + di * di;
  }
  for (const p of pz.poles) {
    const dr = p.re;
    const di = omega - p.im;
    m /= dr * dr + di * di;
  }
  return m;
}

/**
 * Sign that makes the low-frequency loop gain positive (negative feedback at DC): the sign of the
 * low-frequency asymptote K0/s^m, which is the sign of A(0) when there is no root at the origin.
 */
export function lowFrequencySign(pz: PoleZeroForm): number {
  let sign = Math.sign(pz.k) || 1;
  for (const z of pz.zeros) if (z.im === 0 && z.re > 0) sign = -sign;
  for (const p of pz.poles) if (p.im === 0 && p.re > 0) sign = -sign;
  return sign;
}

/**
 * Phase of H(jω) in degrees, unwrapped continuously from DC, where it is 0 for a positive low-frequency
 * gain, 180 for a negative one, less 90 per excess pole at the origin.
 */
export function unwrappedPhaseDeg(pz: PoleZeroForm, omega: number, tiny: number): number {
  let phase = lowFrequencySign(pz) < 0 ? Math.PI : 0;
  for (const z of pz.zeros) {
    if (Math.hypot(z.re, z.im) <= tiny) phase += Math.PI / 2;
    else phase += continuousArg(z, omega) - continuousArg(z, 0);
  }
  for (const p of pz.poles) {
    if (Math.hypot(p.re, p.im) <= tiny) phase -= Math.PI / 2;
    else phase -= continuousArg(p, omega) - continuousArg(p, 0);
  }
  return (phase * 180) / Math.PI;
}

/** unwrappedPhaseDeg as a function of ω with the per-root DC terms computed once. */
export function phaseFunction(pz: PoleZeroForm, tiny: number): (omega: number) => number {
  let base = lowFrequencySign(pz) < 0 ? Math.PI : 0;
  const zr: number[] = [];
  const zi: number[] = [];
  const pr: number[] = [];
  const pi: number[] = [];
  for (const z of pz.zeros) {
    if (Math.hypot(z.re, z.im) <= tiny) base += Math.PI / 2;
    else {
      base -= continuousArg(z, 0);
      zr.push(z.re);
      zi.push(z.im);
    }
  }
  for (const p of pz.poles) {
    if (Math.hypot(p.re, p.im) <= tiny) base -= Math.PI / 2;
    else {
      base += continuousArg(p, 0);
      pr.push(p.re);
      pi.push(p.im);
    }
  }
  const arg = (re: number, im: number, w: number) => {
    const t = Math.atan2(w - im, -re);
    return re > 0 && t < 0 ? t + 2 * Math.PI : t;
  };
  return (w) => {
    let phase = base;
    for (let i = 0; i < zr.length; i++) phase += arg(zr[i], zi[i], w);
    for (let i = 0; i < pr.length; i++) phase -= arg(pr[i], pi[i], w);
    return (phase * 180) / Math.PI;
  };
}

/** Bode data from the pole/zero/gain form, scaled by `gain` (e.g. β and a sign). */
export function pzBode(pz: PoleZeroForm, hz: readonly number[], gain = 1, tiny = 0): Bode {
  const scaled = { ...pz, k: pz.k * gain };
  return {
    magDb: hz.map((f) => 10 * Math.log10(magnitudeSquared(scaled, 2 * Math.PI * f))),
    phaseDeg: hz.map((f) => unwrappedPhaseDeg(scaled, 2 * Math.PI * f, tiny)),
  };
}

/**
 * Bode data from the direct nodal solve, the phase unwrapped along increasing frequency from a start
 * well below every root (where it equals its DC value, `dcPhaseDeg` up to a multiple of 360°), bisecting
 * any step that turns by more than 90°.
 */
export function nodalBode(
  net: Network,
  hz: readonly number[],
  gain = 1,
  startOmega = 0,
  dcPhaseDeg = 0,
): Bode {
  const magDb: number[] = [];
  const phaseDeg: number[] = [];
  const at = (w: number): [number, number] => {
    const [r, i] = nodalResponse(net, w);
    return [r * gain, i * gain];
  };
  const wrap = (w: number) => {
    const [r, i] = at(w);
    return (Math.atan2(i, r) * 180) / Math.PI;
  };
  let prevW = startOmega;
  // The branch at the start is the one nearest the DC convention (0 or 180°, less 90° per integrator).
  const raw0 = wrap(startOmega);
  let prevPhase = raw0 + 360 * Math.round((dcPhaseDeg - raw0) / 360);
  // Splits left for the current sample: a phase that keeps jumping (NaN from a network out of double
  // range, or roundoff) would otherwise cost up to 2^31 solves through the two-way recursion.
  let splits = 0;
  const follow = (w0: number, p0: number, w1: number, depth: number): number => {
    const raw = wrap(w1);
    const p1 = raw + 360 * Math.round((p0 - raw) / 360);
    if (!Number.isFinite(p1) || Math.abs(p1 - p0) <= 90 || depth > 30 || --splits < 0) return p1;
    const mid = w0 > 0 ? Math.sqrt(w0 * w1) : w1 / 2;
    const pm = follow(w0, p0, mid, depth + 1);
    return follow(mid, pm, w1, depth + 1);
  };
  for (const f of hz) {
    const w = 2 * Math.PI * f;
    const [r, i] = at(w);
    magDb.push(10 * Math.log10(r * r + i * i));
    splits = MAX_SPLITS_PER_SAMPLE;
    const p = follow(prevW, prevPhase, w, 0);
    phaseDeg.push(p);
    prevW = w;
    prevPhase = p;
  }
  return { magDb, phaseDeg };
}

// Loop metrics from the exact pole/zero/gain form: every unity crossing (bracketed on a log grid that spans
// all roots, refined by Brent), phase margin at the last downward crossing, gain margin at the lowest
// phase crossover, and closed-loop peaking.
import type { Complex, Crossing, LoopMetrics } from './types';
import { magnitudeSquared, unwrappedPhaseDeg, type PoleZeroForm } from './frequency';
import { brentRoot, goldenMax } from '../numeric/roots';

const POINTS_PER_DECADE = 12;

/** Frequency span (rad/s) that holds every root a few decades either side, and any gain crossing. */
export function frequencySpan(
  pz: PoleZeroForm,
  dcMagnitude: number,
): { lo: number; hi: number; tiny: number } {
  const mags: number[] = [];
  for (const r of [...pz.poles, ...pz.zeros]) {
    const m = Math.hypot(r.re, r.im);
    if (m > 0 && Number.isFinite(m)) mags.push(m);
  }
  if (mags.length === 0) return { lo: 1, hi: 1e6, tiny: 0 };
  const min = Math.min(...mags);
  const max = Math.max(...mags);
  // Roots below this are at the origin to working precision.
  const tiny = max * 1e-14;
  const gainRoom = Number.isFinite(dcMagnitude) ? Math.max(1, Math.min(dcMagnitude, 1e15)) : 1e15;
  return { lo: min / 1e3, hi: max * 1e3 * Math.sqrt(gainRoom) * 10, tiny };
}

export function logGrid(lo: number, hi: number, perDecade = POINTS_PER_DECADE): number[] {
  const decades = Math.log10(hi / lo);
  const count = Math.max(2, Math.ceil(decades * perDecade) + 1);
  const step = decades / (count - 1);
  return Array.from({ length: count }, (_, i) => lo * 10 ** (i * step));
}

/**
 * All ω where |H(jω)| = 1, lowest first, with direction. f(u) = ln|H|² at ω = e^u; sign changes on the grid
 * are refined by Brent; a grid extremum close to unity is refined by golden search so that a narrow
 * excursion through unity between two grid points is not missed.
 */
export function unityCrossings(
  pz: PoleZeroForm,
  grid: readonly number[],
): { omega: number; down: boolean }[] {
  const f = (u: number) => Math.log(magnitudeSquared(pz, Math.exp(u)));
  const us = grid.map(Math.log);
  const fs = us.map(f);
  const out: { omega: number; down: boolean }[] = [];
  const bracket = (a: number, b: number, fa: number, fb: number) => {
    const u = brentRoot(f, a, b, fa, fb, 1e-13);
    out.push({ omega: Math.exp(u), down: fa > fb });
  };
  for (let i = 0; i + 1 < us.length; i++) {
    const fa = fs[i];
    const fb = fs[i + 1];
    if (!Number.isFinite(fa) || !Number.isFinite(fb)) continue;
    if (fa > 0 !== fb > 0) {
      bracket(us[i], us[i + 1], fa, fb);
    }
  }
  for (let i = 1; i + 1 < us.length; i++) {
    const fm = fs[i];
    if (Math.abs(fm) > 0.7 || !Number.isFinite(fm)) continue;
    const isPeak = fm >= fs[i - 1] && fm >= fs[i + 1] && fm < 0;
    const isDip = fm <= fs[i - 1] && fm <= fs[i + 1] && fm > 0;
    if (!isPeak && !isDip) continue;
    const sign = isPeak ? 1 : -1;
    const ext = goldenMax((u) => sign * f(u), us[i - 1], us[i + 1], 1e-12);
    const fe = sign * ext.value;
    if (fe > 0 === fm > 0) continue;
    bracket(us[i - 1], ext.x, fs[i - 1], fe);
    bracket(ext.x, us[i + 1], fe, fs[i + 1]);
  }
  out.sort((a, b) => a.omega - b.omega);
  return out;
}

/** Lowest ω where the unwrapped phase passes an odd multiple of 180°, or undefined. */
export function phaseCrossover(pz: PoleZeroForm, grid: readonly number[], tiny: number): number | undefined {
  const ph = (u: number) => unwrappedPhaseDeg(pz, Math.exp(u), tiny);
  const level = (p: number) => Math.floor((p + 180) / 360);
  let pu = Math.log(grid[0]);
  let pp = ph(pu);
  for (let i = 1; i < grid.length; i++) {
    const u = Math.log(grid[i]);
    const p = ph(u);
    const la = level(pp);
    const lb = level(p);
    if (la !== lb) {
      const target = 360 * Math.max(la, lb) - 180;
      const w = brentRoot((x) => ph(x) - target, pu, u, pp - target, p - target, 1e-13);
      return Math.exp(w);
    }
    pu = u;
    pp = p;
  }
  return undefined;
}

export interface LoopInput {
  /** The open-loop A(s) in pole/zero/gain form. */
  readonly open: PoleZeroForm;
  /** Closed-loop poles of σA/(1 + βσA). */
  readonly closedPoles: readonly Complex[];
  /** Signed open-loop DC gain A(0) (±Infinity with a pole at the origin). */
  readonly dcGain: number;
  readonly beta: number;
  /** The sign σ that makes the DC loop gain negative feedback. */
  readonly sign: number;
  readonly grid: readonly number[];
  readonly tiny: number;
  /** d of the open-loop realisation (0 unless the output has a capacitive feedthrough). */
  readonly d: number;
}

export function loopMetrics(input: LoopInput): LoopMetrics {
  const { open, beta, sign, grid, tiny } = input;
  const loop: PoleZeroForm = { ...open, k: open.k * beta * sign };
  const dcLoop = Math.abs(beta * input.dcGain);
  const crossings: Crossing[] = unityCrossings(loop, grid).map((c) => ({
    hz: c.omega / (2 * Math.PI),
    direction: c.down ? 'down' : 'up',
    phaseDeg: unwrappedPhaseDeg(loop, c.omega, tiny),
  }));
  const lastDown = [...crossings].reverse().find((c) => c.direction === 'down');
  const wpc = phaseCrossover(loop, grid, tiny);
  const gainMarginDb = wpc === undefined ? undefined : -10 * Math.log10(magnitudeSquared(loop, wpc));
  return {
    dcGain: dcLoop,
    crossings,
    ugfHz: lastDown?.hz,
    phaseMarginDeg: lastDown ? 180 + lastDown.phaseDeg : undefined,
    gainMarginDb,
    phaseCrossoverHz: wpc === undefined ? undefined : wpc / (2 * Math.PI),
    peakingDb: closedLoopPeakingDb(input),
  };
}

/** Peak of |σA/(1 + βσA)| over its DC value, dB (0 without a peak). */
function closedLoopPeakingDb(input: LoopInput): number {
  const { open, beta, sign, d } = input;
  // The closed loop keeps the open-loop zeros; its leading coefficient is σk/(1 + βσd) when d ≠ 0 and
  // σk otherwise (the denominator stays monic of the same degree).
  const kcl = d !== 0 && open.k === d ? (sign * d) / (1 + beta * sign * d) : sign * open.k;
  const cl: PoleZeroForm = { poles: input.closedPoles, zeros: open.zeros, k: kcl };
  const a0 = sign * input.dcGain;
  const h0 = Number.isFinite(a0) ? a0 / (1 + beta * a0) : 1 / beta;
  const h0sq = h0 * h0;
  if (!(h0sq > 0) || !Number.isFinite(h0sq)) return 0;
  const us = input.grid.map(Math.log);
  const g = (u: number) => magnitudeSquared(cl, Math.exp(u));
  let best = 0;
  let bi = -1;
  for (let i = 0; i < us.length; i++) {
    const v = g(us[i]);
    if (v > best) {
      best = v;
      bi = i;
    }
  }
  if (bi > 0 && bi < us.length - 1) best = Math.max(best, goldenMax(g, us[bi - 1], us[bi + 1], 1e-12).value);
  const ratio = best / h0sq;
  return ratio > 1 ? 10 * Math.log10(ratio) : 0;
}

// Loop metrics from the exact pole/zero/gain form: every unity crossing (bracketed on a log grid that spans
// all roots, refined by Brent), phase margin at the worst crossing, gain margin at the lowest
// phase crossover, and closed-loop peaking. ln|A(jω)|² is sampled once; the loop gain L = β·σ·A differs
// from it by the constant ln β², so the open-loop and loop crossings come from the same samples.
import type { Complex, Crossing, LoopMetrics } from './types';
import { lowFrequencySign, unwrappedPhaseDeg, type PoleZeroForm } from './frequency';
import { brentRoot, goldenMax } from '../numeric/roots';
import { wrapDeg } from './stability';

const POINTS_PER_DECADE = 10;

/**
 * Frequency span (rad/s) holding every root with room either side and every unity crossing of
 * |gain·H|. Above ten times the largest root each factor |jω − r| is within 10 % of ω, so
 * |H| ≤ |k·gain|·1.1^nz·ω^(nz−np)/0.9^np, which bounds the last crossing for a strictly proper H.
 */
export function frequencySpan(
  pz: PoleZeroForm,
  gain = 1,
  dcMagnitudes: readonly number[] = [],
): { lo: number; hi: number; tiny: number } {
  let min = Infinity;
  let max = 0;
  for (const list of [pz.poles, pz.zeros]) {
    for (const r of list) {
      const m = Math.sqrt(r.re * r.re + r.im * r.im);
      if (m > 0 && Number.isFinite(m)) {
        if (m < min) min = m;
        if (m > max) max = m;
      }
    }
  }
  if (max === 0) return { lo: 1, hi: 1e6, tiny: 0 };
  // Roots below this are at the origin to working precision.
  const tiny = max * 1e-14;
  const rho = pz.poles.length - pz.zeros.length;
  let hi = max * 1e3;
  if (rho >= 1) {
    const bound = Math.abs(pz.k * gain) * 1.1 ** pz.zeros.length * (1 / 0.9) ** pz.poles.length;
    hi = 2 * Math.max(10 * max, bound ** (1 / rho));
  }
  // Below the lowest root |H|² ≈ |H(0)|²(1 − O(ω²/min²)), so a DC magnitude close to 1 crosses unity
  // near min·√|H(0)² − 1|: start low enough to see it.
  let lo = min / 100;
  for (const m of dcMagnitudes) {
    // A DC magnitude within rounding of 1 has no crossing worth seeing (see dcRoundingCrossing).
    if (!Number.isFinite(m) || m === 0 || Math.abs(m - 1) <= DC_UNITY_ROUNDING) continue;
    const near = Math.sqrt(Math.abs(m * m - 1));
    if (near < 1) lo = Math.min(lo, (min * Math.max(near, 1e-6)) / 100);
  }
  return { lo, hi: Math.min(hi, max * 1e15), tiny };
}

export function logGrid(lo: number, hi: number, perDecade = POINTS_PER_DECADE): number[] {
  const decades = Math.log10(hi / lo);
  const count = Math.max(2, Math.ceil(decades * perDecade) + 1);
  const ratio = 10 ** (decades / (count - 1));
  const out = new Array<number>(count);
  out[0] = lo;
  for (let i = 1; i < count; i++) out[i] = out[i - 1] * ratio;
  return out;
}

/** ln|H(jω)|² at ω = e^u, with the roots unpacked into flat arrays once. */
export function logMagnitudeFunction(pz: PoleZeroForm): (u: number) => number {
  const nz = pz.zeros.length;
  const np = pz.poles.length;
  const zr = new Float64Array(nz);
  const zi = new Float64Array(nz);
  const pr = new Float64Array(np);
  const pi = new Float64Array(np);
  pz.zeros.forEach((z, i) => {
    zr[i] = z.re;
    zi[i] = z.im;
  });
  pz.poles.forEach((p, i) => {
    pr[i] = p.re;
    pi[i] = p.im;
  });
  const k2 = pz.k * pz.k;
  return (u) => {
    const w = Math.exp(u);
    let m = k2;
    for (let i = 0; i < nz; i++) {
      const di = w - zi[i];
      m *= zr[i] * zr[i] + di * di;
    }
    for (let i = 0; i < np; i++) {
      const di = w - pi[i];
      m /= pr[i] * pr[i] + di * di;
    }
    return Math.log(m);
  };
}

/** |H|² sampled on a grid of ω, with ln|H|² at ω = e^u for refinement. */
export interface Samples {
  readonly us: Float64Array;
  /** |H(jω)|² at ω = e^us[i]. */
  readonly ms: Float64Array;
  readonly f: (u: number) => number;
}

export function sample(pz: PoleZeroForm, grid: readonly number[]): Samples {
  const us = new Float64Array(grid.length);
  for (let i = 0; i < grid.length; i++) us[i] = Math.log(grid[i]);
  return sampleWithLogs(pz, grid, us);
}

/**
 * logGrid(lo, hi) and its samples. ln ω on a geometric grid is ln lo + i·ln ratio (to a few ulps), so
 * no logarithm is taken per point.
 */
export function sampleLogGrid(
  pz: PoleZeroForm,
  lo: number,
  hi: number,
): { grid: number[]; samples: Samples } {
  const grid = logGrid(lo, hi);
  const n = grid.length;
  const us = new Float64Array(n);
  const u0 = Math.log(lo);
  const du = Math.log(hi / lo) / (n - 1);
  for (let i = 0; i < n; i++) us[i] = u0 + i * du;
  return { grid, samples: sampleWithLogs(pz, grid, us) };
}

function sampleWithLogs(pz: PoleZeroForm, grid: readonly number[], us: Float64Array): Samples {
  const f = logMagnitudeFunction(pz);
  const n = grid.length;
  const ms = new Float64Array(n);
  const nz = pz.zeros.length;
  const np = pz.poles.length;
  // Flat copies of the roots: the inner loops then read typed arrays, not objects.
  const roots = new Float64Array(2 * (nz + np));
  for (let j = 0; j < nz; j++) {
    roots[2 * j] = pz.zeros[j].re;
    roots[2 * j + 1] = pz.zeros[j].im;
  }
  for (let j = 0; j < np; j++) {
    roots[2 * (nz + j)] = pz.poles[j].re;
    roots[2 * (nz + j) + 1] = pz.poles[j].im;
  }
  const k2 = pz.k * pz.k;
  for (let i = 0; i < n; i++) {
    const w = grid[i];
    // Numerator and denominator products, one division; overflow or underflow of either (many roots
    // decades apart) falls back to dividing factor by factor.
    let num = k2;
    for (let j = 0; j < nz; j++) {
      const re = roots[2 * j];
      const di = w - roots[2 * j + 1];
      num *= re * re + di * di;
    }
    let den = 1;
    for (let j = nz; j < nz + np; j++) {
      const re = roots[2 * j];
      const di = w - roots[2 * j + 1];
      den *= re * re + di * di;
    }
    let m = num / den;
    if (!(den > 1e-290 && den < 1e290 && Math.abs(num) < 1e290 && (num === 0 || Math.abs(num) > 1e-290))) {
      m = k2;
      for (let j = 0; j < nz; j++) {
        const re = roots[2 * j];
        const di = w - roots[2 * j + 1];
        m *= re * re + di * di;
      }
      for (let j = nz; j < nz + np; j++) {
        const re = roots[2 * j];
        const di = w - roots[2 * j + 1];
        m /= re * re + di * di;
      }
    }
    ms[i] = m;
  }
  return { us, ms, f };
}

/**
 * All ω where |gain·H(jω)| = 1 (gain2 = gain²), lowest first, with direction. Sign changes of
 * gain²·|H|² − 1 on the grid are refined by Brent on ln|gain·H|²; a grid extremum close to unity is refined
 * by golden search so that a narrow excursion through unity between two grid points is not missed.
 */
export function crossingsOf(
  s: Samples,
  gain2 = 1,
  probes: readonly number[] = [],
): { omega: number; down: boolean }[] {
  const { us, ms } = mergeProbes(s, probes);
  const offset = Math.log(gain2);
  const f = (u: number) => s.f(u) + offset;
  const out: { omega: number; down: boolean }[] = [];
  const bracket = (a: number, b: number, fa: number, fb: number) => {
    const u = brentRoot(f, a, b, fa, fb, 1e-13);
    out.push({ omega: Math.exp(u), down: fa > fb });
  };
  const n = us.length;
  for (let i = 0; i + 1 < n; i++) {
    const a = ms[i] * gain2;
    const b = ms[i + 1] * gain2;
    if (!(a > 0 && b > 0 && a < Infinity && b < Infinity)) continue;
    if (a > 1 !== b > 1) bracket(us[i], us[i + 1], Math.log(a), Math.log(b));
  }
  // e^±0.7: extrema this close to unity are searched for a hidden pair of crossings.
  const lo = 0.4966;
  const hi = 2.0138;
  for (let i = 1; i + 1 < n; i++) {
    const m = ms[i] * gain2;
    if (!(m > lo && m < hi)) continue;
    const l = ms[i - 1] * gain2;
    const r = ms[i + 1] * gain2;
    const isPeak = m >= l && m >= r && m < 1;
    const isDip = m <= l && m <= r && m > 1;
    if (!isPeak && !isDip) continue;
    const sign = isPeak ? 1 : -1;
    const ext = goldenMax((u) => sign * f(u), us[i - 1], us[i + 1], 1e-12);
    const fe = sign * ext.value;
    if (fe > 0 === m > 1) continue;
    bracket(us[i - 1], ext.x, Math.log(l), fe);
    bracket(ext.x, us[i + 1], fe, Math.log(r));
  }
  out.sort((a, b) => a.omega - b.omega);
  return out;
}

/**
 * The samples with extra points at `probes` (rad/s) inserted in order. A lightly damped pole pair lifts
 * |H| in a band about 2ζ|p| wide around ω = Im p, which a grid of ten points a decade can step over
 * entirely: a sample there makes its crossings visible to the bracketing (and a lightly damped zero pair's
 * notch likewise).
 */
function mergeProbes(s: Samples, probes: readonly number[]): { us: Float64Array; ms: Float64Array } {
  const inside = probes
    .map(Math.log)
    .filter((u) => u > s.us[0]! && u < s.us[s.us.length - 1]!)
    .sort((a, b) => a - b);
  if (!inside.length) return s;
  const n = s.us.length + inside.length;
  const us = new Float64Array(n);
  const ms = new Float64Array(n);
  let i = 0;
  let j = 0;
  for (let k = 0; k < n; k++) {
    if (j < inside.length && (i >= s.us.length || inside[j]! < s.us[i]!)) {
      us[k] = inside[j]!;
      ms[k] = Math.exp(s.f(inside[j]!));
      j++;
    } else {
      us[k] = s.us[i]!;
      ms[k] = s.ms[i]!;
      i++;
    }
  }
  return { us, ms };
}

/** Frequencies (rad/s) of the lightly damped complex roots, where |H| has a narrow peak or notch. */
export function resonanceProbes(pz: PoleZeroForm): number[] {
  const out: number[] = [];
  for (const r of [...pz.poles, ...pz.zeros]) {
    const m = Math.hypot(r.re, r.im);
    if (r.im > 0 && Math.abs(r.re) < 0.5 * m) out.push(r.im);
  }
  return out;
}

/** All unity crossings of |H(jω)| on a grid (convenience for one-off use). */
export function unityCrossings(pz: PoleZeroForm, grid: readonly number[]) {
  return crossingsOf(sample(pz, grid));
}

/**
 * Bounds of the unwrapped phase over all ω > 0 (degrees): from its DC value each left-half-plane pole or
 * right-half-plane zero can lag by at most 90°, each left-half-plane zero or right-half-plane pole lead by
 * at most 90°; roots at the origin add a constant.
 */
function phaseBounds(pz: PoleZeroForm, tiny: number, dc: number): { min: number; max: number } {
  let lag = 0;
  let lead = 0;
  for (const z of pz.zeros) {
    if (Math.sqrt(z.re * z.re + z.im * z.im) <= tiny) continue;
    if (z.re > 0) lag += 90;
    else lead += 90;
  }
  for (const p of pz.poles) {
    if (Math.sqrt(p.re * p.re + p.im * p.im) <= tiny) continue;
    if (p.re < 0) lag += 90;
    else lead += 90;
  }
  return { min: dc - lag, max: dc + lead };
}

/**
 * The unwrapped phase (degrees) split into a part that never decreases and one that never increases
 * with ω: arg(jω − r) rises with ω for a root in the left half-plane and falls for one in the right
 * (on the continuous branch), so zeros on the left and poles on the right add to the rising part, the
 * others to the falling part. Over [a, b] the phase then lies in [rise(a) + fall(b), rise(b) + fall(a)].
 * `at(w)` fills `rise` and `fall`.
 */
function phaseParts(pz: PoleZeroForm, tiny: number) {
  // The DC convention: 0 or 180° by the low-frequency sign, ±90° per root at the origin.
  let base = lowFrequencySign(pz) < 0 ? 180 : 0;
  for (const z of pz.zeros) if (Math.sqrt(z.re * z.re + z.im * z.im) <= tiny) base += 90;
  for (const p of pz.poles) if (Math.sqrt(p.re * p.re + p.im * p.im) <= tiny) base -= 90;
  const zr: number[] = [];
  const zi: number[] = [];
  const pr: number[] = [];
  const pi: number[] = [];
  for (const z of pz.zeros) {
    if (Math.sqrt(z.re * z.re + z.im * z.im) <= tiny) continue;
    zr.push(z.re);
    zi.push(z.im);
  }
  for (const p of pz.poles) {
    if (Math.sqrt(p.re * p.re + p.im * p.im) <= tiny) continue;
    pr.push(p.re);
    pi.push(p.im);
  }
  const arg0 = (re: number, im: number) => {
    const t = Math.atan2(-im, -re);
    return re > 0 && t < 0 ? t + 2 * Math.PI : t;
  };
  // Each term relative to its DC value, so that rise(0) + fall(0) = base.
  const z0 = zr.map((re, i) => arg0(re, zi[i]));
  const p0 = pr.map((re, i) => arg0(re, pi[i]));
  const out = { rise: 0, fall: 0 };
  const toDeg = 180 / Math.PI;
  const at = (w: number) => {
    let rise = 0;
    let fall = 0;
    for (let i = 0; i < zr.length; i++) {
      const re = zr[i];
      let t = Math.atan2(w - zi[i], -re);
      if (re > 0 && t < 0) t += 2 * Math.PI;
      if (re <= 0) rise += t - z0[i];
      else fall += t - z0[i];
    }
    for (let i = 0; i < pr.length; i++) {
      const re = pr[i];
      let t = Math.atan2(w - pi[i], -re);
      if (re > 0 && t < 0) t += 2 * Math.PI;
      if (re > 0) rise -= t - p0[i];
      else fall -= t - p0[i];
    }
    out.rise = base + rise * toDeg;
    out.fall = fall * toDeg;
    return out;
  };
  return at;
}

/**
 * Lowest ω where the unwrapped phase passes an odd multiple of 180°, or undefined. The phase is judged at
 * every third grid point (about three a decade) and a change of 360°-band between neighbours is refined
 * by Brent. Runs of points are skipped, without evaluating inside them, where the monotone bounds of
 * phaseParts keep the phase inside one band throughout: the answer is the one the full scan would give.
 */
export function phaseCrossover(pz: PoleZeroForm, grid: readonly number[], tiny: number): number | undefined {
  const parts = phaseParts(pz, tiny);
  // Skip the scan when the phase cannot reach ±180° at all (a one- or two-pole loop without RHP roots).
  const dc = parts(grid[0] * 1e-6);
  const bounds = phaseBounds(pz, tiny, dc.rise + dc.fall);
  if (bounds.min > -180 && bounds.max < 180) return undefined;
  const ph = (u: number) => {
    const p = parts(Math.exp(u));
    return p.rise + p.fall;
  };
  const level = (p: number) => Math.floor((p + 180) / 360);
  // The scan points: grid indices 0, 3, 6, … and the last.
  const idx: number[] = [0];
  for (let i = 3; i < grid.length + 2; i += 3) {
    if (i >= grid.length) i = grid.length - 1;
    idx.push(i);
  }
  const k = idx.length;
  const us = new Float64Array(k);
  const rise = new Float64Array(k).fill(NaN);
  const fall = new Float64Array(k);
  const eval_ = (j: number) => {
    if (!Number.isNaN(rise[j])) return;
    us[j] = Math.log(grid[idx[j]]);
    const p = parts(Math.exp(us[j]));
    rise[j] = p.rise;
    fall[j] = p.fall;
  };
  // Depth-first over index ranges, left half first, so the first band change found is the lowest.
  const search = (a: number, b: number): number | undefined => {
    eval_(a);
    eval_(b);
    const lo = rise[a] + fall[b];
    const hi = rise[b] + fall[a];
    if (level(lo) === level(hi)) return undefined;
    if (b === a + 1) {
      const pa = rise[a] + fall[a];
      const pb = rise[b] + fall[b];
      const la = level(pa);
      const lb = level(pb);
      if (la === lb) return undefined;
      const target = 360 * Math.max(la, lb) - 180;
      return Math.exp(brentRoot((x) => ph(x) - target, us[a], us[b], pa - target, pb - target, 1e-13));
    }
    const mid = (a + b) >> 1;
    return search(a, mid) ?? search(mid, b);
  };
  return k < 2 ? undefined : search(0, k - 1);
}

export interface LoopInput {
  /** The open-loop A(s) in pole/zero/gain form. */
  readonly open: PoleZeroForm;
  /** ln|A|² on the grid. */
  readonly samples: Samples;
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
  /** Crossings and phase margin only (no gain margin or peaking). */
  readonly light?: boolean;
}

/** A loop gain this close to 1 at DC is unity to the precision of the network solve. */
const DC_UNITY_ROUNDING = 1e-9;

/**
 * True for a crossing that only the rounding of a DC gain of exactly 1 puts there: below a thousandth of
 * the lowest root every factor |jω − r| is within 1e-6 of its DC value, so only a DC gain within rounding
 * of unity can cross there, and that crossing says nothing about the loop.
 */
function dcRoundingCrossing(omega: number, dcLoop: number, pz: PoleZeroForm, tiny: number): boolean {
  if (Math.abs(dcLoop - 1) > DC_UNITY_ROUNDING) return false;
  let lowest = Infinity;
  for (const r of [...pz.poles, ...pz.zeros]) {
    const m = Math.hypot(r.re, r.im);
    if (m > tiny && m < lowest) lowest = m;
  }
  return omega < 1e-3 * lowest;
}

export function loopMetrics(input: LoopInput): LoopMetrics {
  const { open, beta, sign, grid, tiny } = input;
  const loop: PoleZeroForm = { ...open, k: open.k * beta * sign };
  const dcLoop = Math.abs(beta * input.dcGain);
  const crossings: Crossing[] = crossingsOf(input.samples, beta * beta, resonanceProbes(open))
    .filter((c) => !dcRoundingCrossing(c.omega, dcLoop, open, tiny))
    .map((c) => ({
      hz: c.omega / (2 * Math.PI),
      direction: c.down ? 'down' : 'up',
      phaseDeg: unwrappedPhaseDeg(loop, c.omega, tiny),
    }));
  let lastDown: Crossing | undefined;
  let firstDown: Crossing | undefined;
  for (const c of crossings) {
    if (c.direction !== 'down') continue;
    lastDown = c;
    firstDown ??= c;
  }
  // The margin is read at every crossing of the unit circle, and the smallest one is the loop's: with a
  // single crossing this is the usual phase margin.
  let pm: { deg: number; hz: number } | undefined;
  for (const c of crossings) {
    const deg = wrapDeg(180 + c.phaseDeg);
    if (!pm || deg < pm.deg) pm = { deg, hz: c.hz };
  }
  const wpc = input.light ? undefined : phaseCrossover(loop, grid, tiny);
  const gainMarginDb =
    wpc === undefined
      ? undefined
      : (-10 * (input.samples.f(Math.log(wpc)) + Math.log(beta * beta))) / Math.LN10;
  return {
    dcGain: dcLoop,
    crossings,
    ugfHz: lastDown?.hz,
    lowestUgfHz: firstDown?.hz,
    phaseMarginDeg: pm?.deg,
    phaseMarginHz: pm?.hz,
    gainMarginDb,
    phaseCrossoverHz: wpc === undefined ? undefined : wpc / (2 * Math.PI),
    peakingDb: input.light ? 0 : closedLoopPeakingDb(input),
  };
}

/**
 * Peak of |σA/(1 + βσA)| over its DC value, dB (0 without a peak). A peak of a rational response lies
 * near its poles or zeros, so the search spans the closed-loop roots a decade either side.
 */
/**
 * The closed loop σA/(1 + βσA) in pole/zero/gain form: it keeps the open-loop zeros over the closed-loop
 * poles; its leading coefficient is σk/(1 + βσd) when d ≠ 0 and σk otherwise (the denominator stays monic
 * of the same degree), and its DC value a0/(1 + β·a0) with a0 = σA(0) (1/β with a pole at the origin).
 */
export function factorClosedLoop(
  input: Pick<LoopInput, 'open' | 'beta' | 'sign' | 'd' | 'closedPoles' | 'dcGain'>,
): PoleZeroForm & { readonly dc: number } {
  const { open, beta, sign, d } = input;
  const kcl = d !== 0 && open.k === d ? (sign * d) / (1 + beta * sign * d) : sign * open.k;
  const a0 = sign * input.dcGain;
  const dc = Number.isFinite(a0) ? a0 / (1 + beta * a0) : 1 / beta;
  return { poles: input.closedPoles, zeros: open.zeros, k: kcl, dc };
}

function closedLoopPeakingDb(input: LoopInput): number {
  const cl = factorClosedLoop(input);
  const h0 = cl.dc;
  const h0sq = h0 * h0;
  if (!(h0sq > 0) || !Number.isFinite(h0sq)) return 0;
  const span = frequencySpan(cl);
  if (span.tiny === 0) return 0;
  const { grid, samples } = sampleLogGrid(cl, span.lo * 10, (span.tiny / 1e-14) * 10);
  let best = -Infinity;
  let bi = -1;
  for (let i = 0; i < grid.length; i++) {
    if (samples.ms[i] > best) {
      best = samples.ms[i];
      bi = i;
    }
  }
  best = Math.log(best);
  if (bi > 0 && bi < grid.length - 1) {
    // Only the peak's value is needed, and it is flat to second order at the maximum: an abscissa to 1e-8
    // (relative) gives the value to about 1e-15.
    best = Math.max(best, goldenMax(samples.f, samples.us[bi - 1], samples.us[bi + 1], 1e-8).value);
  }
  const ratioDb = (10 * (best - Math.log(h0sq))) / Math.LN10;
  return ratioDb > 0 ? ratioDb : 0;
}

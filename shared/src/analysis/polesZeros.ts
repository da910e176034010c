// Poles, zeros and the high-frequency gain of a realisation, so that H(s) = k·Π(s − z)/Π(s − p).
import type { StateSpace } from './realization';
import type { Complex } from './types';
import { eigenvalues } from '../numeric/eigenvalues';
import { nullSpaceBasis } from '../numeric/householder';
import { norm2, normFrobenius } from '../numeric/dense';
import { ScratchPool } from '../numeric/workspace';

// Matrices handed to the eigenvalue routine (which copies them) and the projection's intermediates.
const feedthroughPool = new ScratchPool();
const zeroDynamicsPool = new ScratchPool();
const rowsPool = new ScratchPool();
const projectedPool = new ScratchPool();
const reducedPool = new ScratchPool();

export interface PoleZeroGain {
  readonly poles: Complex[];
  readonly zeros: Complex[];
  /** Leading coefficient: d when d ≠ 0, else the first non-zero Markov parameter c·A^(ρ−1)·b. */
  readonly k: number;
  /** Relative degree (0 when d ≠ 0); order + 1 when the transfer function is identically zero. */
  readonly relativeDegree: number;
}

/** A Markov parameter or d below this, relative to its own scale, is treated as exactly zero. */
const NEGLIGIBLE = 1e-10;

function toComplex(re: Float64Array, im: Float64Array): Complex[] {
  const out: Complex[] = new Array(re.length);
  for (let i = 0; i < re.length; i++) out[i] = { re: re[i], im: im[i] };
  return out;
}

export function polesOf(sys: StateSpace): Complex[] {
  const e = eigenvalues(sys.A, sys.order);
  return toComplex(e.re, e.im);
}

export function zerosOf(sys: StateSpace): { zeros: Complex[]; k: number; relativeDegree: number } {
  const { order: n, A, b, c, d } = sys;
  const normA = normFrobenius(A);
  const nb = norm2(b);
  const nc = norm2(c);
  if (n === 0) return { zeros: [], k: d, relativeDegree: 0 };
  const scale = normA > 0 ? (nc * nb) / normA : nc * nb;
  if (Math.abs(d) > NEGLIGIBLE * scale && d !== 0) {
    // Zeros are the eigenvalues of A − b·c/d.
    const M = feedthroughPool.get(n * n);
    M.set(A);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) M[i * n + j] -= (b[i] * c[j]) / d;
    const e = eigenvalues(M, n);
    return { zeros: toComplex(e.re, e.im), k: d, relativeDegree: 0 };
  }
  // Relative degree ρ: the first k with c·A^(k−1)·b clearly non-zero.
  const rows: Float64Array[] = [];
  let row: Float64Array = Float64Array.from(c);
  let rho = 0;
  let markov = 0;
  for (let k = 1; k <= n; k++) {
    rows.push(row);
    let m = 0;
    for (let i = 0; i < n; i++) m += row[i] * b[i];
    if (Math.abs(m) > NEGLIGIBLE * norm2(row) * nb && m !== 0) {
      rho = k;
      markov = m;
      break;
    }
    row = rowTimes(row, A, n);
  }
  if (rho === 0) return { zeros: [], k: 0, relativeDegree: n + 1 };
  if (rho === n) return { zeros: [], k: markov, relativeDegree: rho };
  // Zero dynamics: A − b·(c A^(ρ−1) b)⁻¹·c A^ρ restricted to the null space of c, cA, …, cA^(ρ−1).
  const cArho = rowTimes(rows[rho - 1], A, n);
  const Az = zeroDynamicsPool.get(n * n);
  Az.set(A);
  for (let i = 0; i < n; i++) {
    const f = b[i] / markov;
    if (f === 0) continue;
    for (let j = 0; j < n; j++) Az[i * n + j] -= f * cArho[j];
  }
  const R = rowsPool.get(rho * n);
  rows.forEach((r, i) => R.set(r, i * n));
  const N = nullSpaceBasis(R, rho, n);
  const m = n - rho;
  // Nᵀ·Az·N
  const AN = projectedPool.zeroed(n * m);
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < n; k++) {
      const a = Az[i * n + k];
      if (a === 0) continue;
      for (let j = 0; j < m; j++) AN[i * m + j] += a * N[k * m + j];
    }
  }
  const Zd = reducedPool.zeroed(m * m);
  for (let k = 0; k < n; k++) {
    for (let i = 0; i < m; i++) {
      const nki = N[k * m + i];
      if (nki === 0) continue;
      for (let j = 0; j < m; j++) Zd[i * m + j] += nki * AN[k * m + j];
    }
  }
  const e = eigenvalues(Zd, m);
  return { zeros: toComplex(e.re, e.im), k: markov, relativeDegree: rho };
}

function rowTimes(row: Float64Array, A: Float64Array, n: number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v = row[i];
    if (v === 0) continue;
    for (let j = 0; j < n; j++) out[j] += v * A[i * n + j];
  }
  return out;
}

export function poleZeroGain(sys: StateSpace): PoleZeroGain {
  const poles = polesOf(sys);
  const { zeros, k, relativeDegree } = zerosOf(sys);
  return { poles, zeros, k, relativeDegree };
}

/** H(s) from the pole/zero/gain form, as [re, im]. */
export function evaluatePzk(
  pz: { poles: readonly Complex[]; zeros: readonly Complex[]; k: number },
  sRe: number,
  sIm: number,
): [number, number] {
  let re = pz.k;
  let im = 0;
  for (const z of pz.zeros) {
    const ar = sRe - z.re;
    const ai = sIm - z.im;
    const nr = re * ar - im * ai;
    im = re * ai + im * ar;
    re = nr;
  }
  for (const p of pz.poles) {
    const ar = sRe - p.re;
    const ai = sIm - p.im;
    const den = ar * ar + ai * ai;
    const nr = (re * ar + im * ai) / den;
    im = (im * ar - re * ai) / den;
    re = nr;
  }
  return [re, im];
}

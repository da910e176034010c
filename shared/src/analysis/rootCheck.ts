// Each root is checked against the network itself, and the same factorisation gives the null vectors
// from which the participation of each node in a pole is read.
import type { Network } from '../circuit/network';
import type { Complex, Participation } from './types';
import { complexLuFactor, complexNullVectors } from '../numeric/complexLu';

/** Row then column equilibration of a complex matrix; returns the scalings applied. */
function equilibrate(
  re: Float64Array,
  im: Float64Array,
  n: number,
): { rows: Float64Array; cols: Float64Array } {
  const rows = new Float64Array(n).fill(1);
  const cols = new Float64Array(n).fill(1);
  for (let i = 0; i < n; i++) {
    let m = 0;
    for (let j = 0; j < n; j++) m = Math.max(m, Math.abs(re[i * n + j]) + Math.abs(im[i * n + j]));
    if (m > 0) {
      rows[i] = 1 / m;
      for (let j = 0; j < n; j++) {
        re[i * n + j] *= rows[i];
        im[i * n + j] *= rows[i];
      }
    }
  }
  for (let j = 0; j < n; j++) {
    let m = 0;
    for (let i = 0; i < n; i++) m = Math.max(m, Math.abs(re[i * n + j]) + Math.abs(im[i * n + j]));
    if (m > 0) {
      cols[j] = 1 / m;
      for (let i = 0; i < n; i++) {
        re[i * n + j] *= cols[j];
        im[i * n + j] *= cols[j];
      }
    }
  }
  return { rows, cols };
}

export interface PoleCheck {
  /** Last over first pivot of the equilibrated G + sC: near zero at a true pole. */
  readonly residual: number;
  readonly participation: Participation[];
}

export function checkPole(net: Network, s: Complex): PoleCheck {
  const { n, G, C } = net;
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  for (let i = 0; i < n * n; i++) {
    re[i] = G[i] + s.re * C[i];
    im[i] = s.im * C[i];
  }
  const { rows, cols } = equilibrate(re, im, n);
  const f = complexLuFactor(re, im, n);
  const v = complexNullVectors(f);
  // φ = Dc·φ', ψ = Dr·ψ' undo the equilibration; p_i = ψ_i·(Cφ)_i (the scale of ψ, φ cancels in shares).
  const shares = new Float64Array(n);
  let total = 0;
  for (let i = 0; i < n; i++) {
    let cr = 0;
    let ci = 0;
    for (let j = 0; j < n; j++) {
      const cij = C[i * n + j];
      if (cij === 0) continue;
      cr += cij * v.rightRe[j] * cols[j];
      ci += cij * v.rightIm[j] * cols[j];
    }
    const pr = v.leftRe[i] * rows[i];
    const pi = v.leftIm[i] * rows[i];
    const m = Math.hypot(pr * cr - pi * ci, pr * ci + pi * cr);
    shares[i] = m;
    total += m;
  }
  const participation: Participation[] = net.nodes.map((node, i) => ({
    node: node.name,
    share: total > 0 ? shares[i] / total : 0,
  }));
  participation.sort((a, b) => b.share - a.share);
  return { residual: f.pivotRatio, participation };
}

/** Last over first pivot of the equilibrated system matrix [[G + sC, gIn + s·cIn], [e_outᵀ, 0]]. */
export function checkZero(net: Network, s: Complex): number {
  const { n, G, C, gIn, cIn, output } = net;
  const m = n + 1;
  const re = new Float64Array(m * m);
  const im = new Float64Array(m * m);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      re[i * m + j] = G[i * n + j] + s.re * C[i * n + j];
      im[i * m + j] = s.im * C[i * n + j];
    }
    re[i * m + n] = gIn[i] + s.re * cIn[i];
    im[i * m + n] = s.im * cIn[i];
  }
  re[n * m + output] = 1;
  equilibrate(re, im, m);
  return complexLuFactor(re, im, m).pivotRatio;
}

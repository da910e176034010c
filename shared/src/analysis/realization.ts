// Network → a well-scaled state-space realisation (A, b, c, d) of the transfer function vin → v(out).
// Route: split the null space of C by a symmetric eigen-decomposition, eliminate the charge-free
// directions by a Schur complement, scale symmetrically by Λ^(-1/2), and remove the derivative input.
import type { Network } from '../circuit/network';
import type { AnalysisProblem } from './types';
import { symmetricEigen } from '../numeric/symmetricEigen';
import { luFactor, luSolve, luSolveMatrix } from '../numeric/luReal';
import { complexLuFactor, complexNullVectors } from '../numeric/complexLu';
import { conductanceSingular } from './rootCheck';
import { ScratchPool } from '../numeric/workspace';

export interface StateSpace {
  /** Order: the number of finite poles. */
  readonly order: number;
  /** r×r, rad/s. */
  readonly A: Float64Array;
  readonly b: Float64Array;
  readonly c: Float64Array;
  readonly d: number;
}

export type RealizationResult = { ok: true; system: StateSpace } | { ok: false; problems: AnalysisProblem[] };

/** Below this ratio of pivots a resistive block is singular: a node with neither a DC path nor charge. */
const SINGULAR_PIVOT_RATIO = 1e-13;

// Intermediate matrices of one realisation (never returned: A, b and c are fresh arrays).
const guPool = new ScratchPool();
const gtPool = new ScratchPool();
const gtVecPool = new ScratchPool();
const ctVecPool = new ScratchPool();
const grPool = new ScratchPool();
const grVecPool = new ScratchPool();
const gzzPool = new ScratchPool();
const rhsPool = new ScratchPool();
const sPool = new ScratchPool();
const b0Pool = new ScratchPool();
const b1Pool = new ScratchPool();

export function realize(net: Network): RealizationResult {
  const { n, G, C, gIn, cIn, output } = net;
  if (n === 0) return { ok: false, problems: [{ message: 'the design has no nodes besides its input' }] };
  let r = net.capRank;
  const eig = symmetricEigen(C, n);
  const lmax = eig.values[0] ?? 0;
  // The structural rank is exact for positive capacitors; fall back to the values if a kept one is not
  // positive (a negative capacitor written on purpose).
  if (r > 0 && !(eig.values[r - 1] > 0)) {
    r = 0;
    while (r < n && eig.values[r] > 1e-12 * lmax) r++;
  }
  const z = n - r;
  const U = eig.vectors;
  // Gt = Uᵀ G U, gt = Uᵀ gIn.
  const GU = guPool.zeroed(n * n);
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < n; k++) {
      const gik = G[i * n + k];
      if (gik === 0) continue;
      for (let j = 0; j < n; j++) GU[i * n + j] += gik * U[k * n + j];
    }
  }
  const Gt = gtPool.zeroed(n * n);
  for (let k = 0; k < n; k++) {
    for (let i = 0; i < n; i++) {
      const uki = U[k * n + i];
      if (uki === 0) continue;
      for (let j = 0; j < n; j++) Gt[i * n + j] += uki * GU[k * n + j];
    }
  }
  const gt = gtVecPool.get(n);
  const ct = ctVecPool.get(n);
  for (let i = 0; i < n; i++) {
    let sg = 0;
    let sc = 0;
    for (let k = 0; k < n; k++) {
      sg += U[k * n + i] * gIn[k];
      sc += U[k * n + i] * cIn[k];
    }
    gt[i] = sg;
    ct[i] = sc;
  }

  // Schur complement over the charge-free block: X = Gzz⁻¹ [Gzr | gz].
  const Gr = grPool.get(r * r);
  for (let i = 0; i < r; i++) for (let j = 0; j < r; j++) Gr[i * r + j] = Gt[i * n + j];
  const gr = grVecPool.get(r);
  for (let i = 0; i < r; i++) gr[i] = gt[i];
  let X: Float64Array = new Float64Array(0);
  if (z > 0) {
    const Gzz = gzzPool.get(z * z);
    for (let i = 0; i < z; i++) for (let j = 0; j < z; j++) Gzz[i * z + j] = Gt[(r + i) * n + r + j];
    const f = luFactor(Gzz, z);
    if (f.singular || f.pivotRatio < SINGULAR_PIVOT_RATIO) {
      return { ok: false, problems: [floatingNodeProblem(net, U, r, Gzz, z)] };
    }
    const rhs = rhsPool.get(z * (r + 1));
    for (let i = 0; i < z; i++) {
      for (let j = 0; j < r; j++) rhs[i * (r + 1) + j] = Gt[(r + i) * n + j];
      rhs[i * (r + 1) + r] = gt[r + i];
    }
    X = luSolveMatrix(f, rhs, r + 1);
    for (let i = 0; i < r; i++) {
      for (let k = 0; k < z; k++) {
        const grz = Gt[i * n + r + k];
        if (grz === 0) continue;
        for (let j = 0; j < r; j++) Gr[i * r + j] -= grz * X[k * (r + 1) + j];
        gr[i] -= grz * X[k * (r + 1) + r];
      }
    }
  }

  const s = sPool.get(r);
  for (let i = 0; i < r; i++) s[i] = 1 / Math.sqrt(eig.values[i]);
  const A = new Float64Array(r * r);
  for (let i = 0; i < r; i++) for (let j = 0; j < r; j++) A[i * r + j] = -s[i] * Gr[i * r + j] * s[j];
  const b0 = b0Pool.get(r);
  const b1 = b1Pool.get(r);
  for (let i = 0; i < r; i++) {
    b0[i] = -s[i] * gr[i];
    b1[i] = -s[i] * ct[i];
  }
  const b = new Float64Array(r);
  for (let i = 0; i < r; i++) {
    let acc = b0[i];
    for (let j = 0; j < r; j++) acc += A[i * r + j] * b1[j];
    b[i] = acc;
  }
  const c = new Float64Array(r);
  let d0 = 0;
  for (let j = 0; j < r; j++) {
    let acc = U[output * n + j];
    for (let k = 0; k < z; k++) acc -= U[output * n + r + k] * X[k * (r + 1) + j];
    c[j] = acc * s[j];
  }
  for (let k = 0; k < z; k++) d0 -= U[output * n + r + k] * X[k * (r + 1) + r];
  let d = d0;
  for (let j = 0; j < r; j++) d += c[j] * b1[j];
  return { ok: true, system: { order: r, A, b, c, d } };
}

/** Locate the node behind a singular charge-free block from the block's null vector. */
function floatingNodeProblem(
  net: Network,
  U: Float64Array,
  r: number,
  Gzz: Float64Array,
  z: number,
): AnalysisProblem {
  const n = net.n;
  const nv = complexNullVectors(complexLuFactor(Gzz, new Float64Array(z * z), z));
  let best = 0;
  let node = 0;
  for (let i = 0; i < n; i++) {
    let acc = 0;
    for (let k = 0; k < z; k++) acc += U[i * n + r + k] * nv.rightRe[k];
    if (Math.abs(acc) > best) {
      best = Math.abs(acc);
      node = i;
    }
  }
  const name = net.nodes[node].name;
  return {
    message: `node '${name}' has no DC path and no capacitance, so its voltage is undefined; connect it or remove it`,
    node: name,
  };
}

/** Exact DC gain from the nodal equations G·v = −gIn (±Infinity when G is singular: a pole at s = 0). */
export function nodalDcGain(net: Network): number | undefined {
  const f = luFactor(net.G, net.n);
  if (f.singular || (f.pivotRatio < 1e-8 && conductanceSingular(net))) return undefined;
  const rhs = new Float64Array(net.n);
  for (let i = 0; i < net.n; i++) rhs[i] = -net.gIn[i];
  return luSolve(f, rhs)[net.output];
}

// Symmetric eigen-decomposition by cyclic Jacobi rotations: orthogonal, and accurate in the relative sense
// for graded positive semidefinite matrices (capacitances spanning many decades), which is why it is used
// for the capacitance matrix rather than a tridiagonal QR.
import { ScratchPool } from './workspace';

export interface SymmetricEigen {
  /** Eigenvalues, largest first. */
  readonly values: Float64Array;
  /** Eigenvectors as columns of a row-major n×n matrix, in the order of `values`. */
  readonly vectors: Float64Array;
}

const MAX_SWEEPS = 60;

const workPool = new ScratchPool();
const rotationPool = new ScratchPool();

export function symmetricEigen(input: Float64Array, n: number): SymmetricEigen {
  // The rotated matrix and the accumulated rotations are scratch; values and vectors are fresh arrays.
  const a = workPool.get(n * n);
  a.set(input.length === n * n ? input : input.subarray(0, n * n));
  const v = rotationPool.zeroed(n * n);
  for (let i = 0; i < n; i++) v[i * n + i] = 1;
  const eps = 2.220446049250313e-16;
  for (let sweep = 0; sweep < MAX_SWEEPS; sweep++) {
    let rotated = false;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = a[p * n + q];
        if (apq === 0) continue;
        const app = a[p * n + p];
        const aqq = a[q * n + q];
        // Rotate only while the off-diagonal entry matters relative to its own diagonal pair: this
        // stopping rule gives relative accuracy for graded matrices.
        if (Math.abs(apq) <= eps * Math.sqrt(Math.abs(app * aqq))) {
          a[p * n + q] = 0;
          a[q * n + p] = 0;
          continue;
        }
        rotated = true;
        const theta = (aqq - app) / (2 * apq);
        const t = (theta >= 0 ? 1 : -1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = a[k * n + p];
          const akq = a[k * n + q];
          a[k * n + p] = c * akp - s * akq;
          a[k * n + q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p * n + k];
          const aqk = a[q * n + k];
          a[p * n + k] = c * apk - s * aqk;
          a[q * n + k] = s * apk + c * aqk;
        }
        a[p * n + q] = 0;
        a[q * n + p] = 0;
        for (let k = 0; k < n; k++) {
          const vkp = v[k * n + p];
          const vkq = v[k * n + q];
          v[k * n + p] = c * vkp - s * vkq;
          v[k * n + q] = s * vkp + c * vkq;
        }
      }
    }
    if (!rotated) break;
  }
  // Largest first; a stable insertion sort keeps equal values in index order, as a stable sort would.
  const order = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const di = a[i * n + i];
    let j = i;
    while (j > 0 && a[order[j - 1] * n + order[j - 1]] < di) {
      order[j] = order[j - 1];
      j--;
    }
    order[j] = i;
  }
  const values = new Float64Array(n);
  const vectors = new Float64Array(n * n);
  for (let dst = 0; dst < n; dst++) {
    const src = order[dst];
    values[dst] = a[src * n + src];
    for (let k = 0; k < n; k++) vectors[k * n + dst] = v[k * n + src];
  }
  return { values, vectors };
}

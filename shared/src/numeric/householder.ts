// Orthonormal basis of the null space of a few rows, by Householder QR of their transpose.
import { ScratchPool } from './workspace';

const transposePool = new ScratchPool();
const columnPool = new ScratchPool();

/** rows: k×n row-major (k ≤ n). Returns an n×(n−k) matrix whose orthonormal columns span the null space. */
export function nullSpaceBasis(rows: Float64Array, k: number, n: number): Float64Array {
  // Work on Aᵀ (n×k); Q = H_1…H_k; the last n−k columns of Q span the null space of A.
  const a = transposePool.get(n * k);
  for (let i = 0; i < k; i++) for (let j = 0; j < n; j++) a[j * k + i] = rows[i * n + j];
  const vs: Float64Array[] = [];
  for (let c = 0; c < k; c++) {
    const v = new Float64Array(n);
    let s = 0;
    for (let i = c; i < n; i++) s += a[i * k + c] * a[i * k + c];
    const alpha = Math.sqrt(s);
    if (alpha === 0) {
      vs.push(v);
      continue;
    }
    const x0 = a[c * k + c];
    const beta = x0 >= 0 ? -alpha : alpha;
    for (let i = c; i < n; i++) v[i] = a[i * k + c];
    v[c] = x0 - beta;
    let vn = 0;
    for (let i = c; i < n; i++) vn += v[i] * v[i];
    if (vn > 0) {
      for (let j = c; j < k; j++) {
        let d = 0;
        for (let i = c; i < n; i++) d += v[i] * a[i * k + j];
        const f = (2 * d) / vn;
        for (let i = c; i < n; i++) a[i * k + j] -= f * v[i];
      }
      const inv = 1 / Math.sqrt(vn);
      for (let i = c; i < n; i++) v[i] *= inv;
    }
    vs.push(v);
  }
  const m = n - k;
  const out = new Float64Array(n * m);
  for (let col = 0; col < m; col++) {
    const e = columnPool.zeroed(n);
    e[k + col] = 1;
    for (let c = k - 1; c >= 0; c--) {
      const v = vs[c];
      let d = 0;
      for (let i = 0; i < n; i++) d += v[i] * e[i];
      if (d !== 0) for (let i = 0; i < n; i++) e[i] -= 2 * d * v[i];
    }
    for (let i = 0; i < n; i++) out[i * m + col] = e[i];
  }
  return out;
}

// LU factorisation with partial pivoting for small dense real systems.

export interface RealLu {
  readonly n: number;
  /** L (unit lower, below the diagonal) and U (on and above) packed together. */
  readonly lu: Float64Array;
  readonly pivot: Int32Array;
  /** True when a pivot was exactly zero or not finite (the matrix is singular to working precision). */
  readonly singular: boolean;
  /** Smallest |pivot| over largest |pivot|: a cheap conditioning indicator. */
  readonly pivotRatio: number;
}

export function luFactor(a: Float64Array, n: number): RealLu {
  const lu = Float64Array.from(a);
  const pivot = new Int32Array(n);
  let singular = false;
  let minPivot = Infinity;
  let maxPivot = 0;
  for (let k = 0; k < n; k++) {
    let p = k;
    let best = Math.abs(lu[k * n + k]);
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(lu[i * n + k]);
      if (v > best) {
        best = v;
        p = i;
      }
    }
    pivot[k] = p;
    if (p !== k) {
      for (let j = 0; j < n; j++) {
        const t = lu[k * n + j];
        lu[k * n + j] = lu[p * n + j];
        lu[p * n + j] = t;
      }
    }
    const d = lu[k * n + k];
    minPivot = Math.min(minPivot, Math.abs(d));
    maxPivot = Math.max(maxPivot, Math.abs(d));
    if (d === 0 || !Number.isFinite(d)) {
      singular = true;
      continue;
    }
    for (let i = k + 1; i < n; i++) {
      const f = (lu[i * n + k] /= d);
      if (f === 0) continue;
      for (let j = k + 1; j < n; j++) lu[i * n + j] -= f * lu[k * n + j];
    }
  }
  const pivotRatio = n === 0 ? 1 : maxPivot === 0 ? 0 : minPivot / maxPivot;
  return { n, lu, pivot, singular, pivotRatio };
}

/** Solve A·x = b in place of a copy of b. */
export function luSolve(f: RealLu, b: Float64Array): Float64Array {
  const { n, lu, pivot } = f;
  const x = Float64Array.from(b);
  for (let k = 0; k < n; k++) {
    const p = pivot[k];
    if (p !== k) {
      const t = x[k];
      x[k] = x[p];
      x[p] = t;
    }
  }
  for (let i = 0; i < n; i++) {
    let s = x[i];
    for (let j = 0; j < i; j++) s -= lu[i * n + j] * x[j];
    x[i] = s;
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = x[i];
    for (let j = i + 1; j < n; j++) s -= lu[i * n + j] * x[j];
    x[i] = s / lu[i * n + i];
  }
  return x;
}

/** Solve A·X = B for B with m columns (row-major n×m). */
export function luSolveMatrix(f: RealLu, b: Float64Array, m: number): Float64Array {
  const n = f.n;
  const out = new Float64Array(n * m);
  const col = new Float64Array(n);
  for (let j = 0; j < m; j++) {
    for (let i = 0; i < n; i++) col[i] = b[i * m + j];
    const x = luSolve(f, col);
    for (let i = 0; i < n; i++) out[i * m + j] = x[i];
  }
  return out;
}

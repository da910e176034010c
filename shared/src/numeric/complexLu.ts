// LU factorisation of a small dense complex matrix with complete pivoting, kept as separate real and
// imaginary parts. Complete pivoting makes the last pivot a reliable measure of how singular the matrix is,
// and the factors give the right and left null vectors at a root.

export interface ComplexLu {
  readonly n: number;
  readonly re: Float64Array;
  readonly im: Float64Array;
  /** Row permutation: factor row k is original row rowPerm[k]. */
  readonly rowPerm: Int32Array;
  /** Column permutation: factor column k is original column colPerm[k]. */
  readonly colPerm: Int32Array;
  /** |last pivot| / |first pivot| (0 when exactly singular). */
  readonly pivotRatio: number;
}

export function complexLuFactor(reIn: Float64Array, imIn: Float64Array, n: number): ComplexLu {
  const re = Float64Array.from(reIn);
  const im = Float64Array.from(imIn);
  const rowPerm = new Int32Array(n);
  const colPerm = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    rowPerm[i] = i;
    colPerm[i] = i;
  }
  let first = 0;
  let last = 0;
  let real = true;
  for (let i = 0; i < im.length; i++) {
    if (im[i] !== 0) {
      real = false;
      break;
    }
  }
  for (let k = 0; k < n; k++) {
    let bi = k;
    let bj = k;
    let best = -1;
    for (let i = k; i < n; i++) {
      for (let j = k; j < n; j++) {
        const m = real ? Math.abs(re[i * n + j]) : Math.abs(re[i * n + j]) + Math.abs(im[i * n + j]);
        if (m > best) {
          best = m;
          bi = i;
          bj = j;
        }
      }
    }
    if (bi !== k) {
      for (let j = 0; j < n; j++) {
        swap(re, k * n + j, bi * n + j);
        if (!real) swap(im, k * n + j, bi * n + j);
      }
      const t = rowPerm[k];
      rowPerm[k] = rowPerm[bi];
      rowPerm[bi] = t;
    }
    if (bj !== k) {
      for (let i = 0; i < n; i++) {
        swap(re, i * n + k, i * n + bj);
        if (!real) swap(im, i * n + k, i * n + bj);
      }
      const t = colPerm[k];
      colPerm[k] = colPerm[bj];
      colPerm[bj] = t;
    }
    const pr = re[k * n + k];
    const pi = im[k * n + k];
    const mag = Math.sqrt(pr * pr + pi * pi);
    if (k === 0) first = mag;
    last = mag;
    if (mag === 0) continue;
    if (real) {
      // A real matrix (a real root): the same elimination without the imaginary arithmetic.
      for (let i = k + 1; i < n; i++) {
        const a = re[i * n + k];
        if (a === 0) continue;
        const f = a / pr;
        re[i * n + k] = f;
        for (let j = k + 1; j < n; j++) re[i * n + j] -= f * re[k * n + j];
      }
      continue;
    }
    const den = pr * pr + pi * pi;
    for (let i = k + 1; i < n; i++) {
      const ar = re[i * n + k];
      const ai = im[i * n + k];
      if (ar === 0 && ai === 0) continue;
      // f = a / pivot
      const fr = (ar * pr + ai * pi) / den;
      const fi = (ai * pr - ar * pi) / den;
      re[i * n + k] = fr;
      im[i * n + k] = fi;
      for (let j = k + 1; j < n; j++) {
        const ur = re[k * n + j];
        const ui = im[k * n + j];
        re[i * n + j] -= fr * ur - fi * ui;
        im[i * n + j] -= fr * ui + fi * ur;
      }
    }
  }
  const pivotRatio = n === 0 ? 1 : first === 0 ? 0 : last / first;
  return { n, re, im, rowPerm, colPerm, pivotRatio };
}

function swap(a: Float64Array, i: number, j: number): void {
  const t = a[i];
  a[i] = a[j];
  a[j] = t;
}

/** Solve M·x = b for complex b; returns [re, im]. */
export function complexLuSolve(
  f: ComplexLu,
  bRe: Float64Array,
  bIm: Float64Array,
): [Float64Array, Float64Array] {
  const { n, re, im, rowPerm, colPerm } = f;
  const yr = new Float64Array(n);
  const yi = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    yr[i] = bRe[rowPerm[i]];
    yi[i] = bIm[rowPerm[i]];
  }
  for (let i = 0; i < n; i++) {
    let sr = yr[i];
    let sI = yi[i];
    for (let j = 0; j < i; j++) {
      const lr = re[i * n + j];
      const li = im[i * n + j];
      sr -= lr * yr[j] - li * yi[j];
      sI -= lr * yi[j] + li * yr[j];
    }
    yr[i] = sr;
    yi[i] = sI;
  }
  for (let i = n - 1; i >= 0; i--) {
    let sr = yr[i];
    let sI = yi[i];
    for (let j = i + 1; j < n; j++) {
      const ur = re[i * n + j];
      const ui = im[i * n + j];
      sr -= ur * yr[j] - ui * yi[j];
      sI -= ur * yi[j] + ui * yr[j];
    }
    const pr = re[i * n + i];
    const pi = im[i * n + i];
    const den = pr * pr + pi * pi;
    yr[i] = (sr * pr + sI * pi) / den;
    yi[i] = (sI * pr - sr * pi) / den;
  }
  const xr = new Float64Array(n);
  const xi = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    xr[colPerm[k]] = yr[k];
    xi[colPerm[k]] = yi[k];
  }
  return [xr, xi];
}

/**
 * Right and left null vectors of a (numerically) singular matrix from its factors: M·φ ≈ 0 and ψᵀ·M ≈ 0
 * (ψ not conjugated). The last pivot is treated as zero.
 */
export function complexNullVectors(f: ComplexLu): {
  rightRe: Float64Array;
  rightIm: Float64Array;
  leftRe: Float64Array;
  leftIm: Float64Array;
} {
  const { n, re, im, rowPerm, colPerm } = f;
  // Right: U z = 0 with z[n-1] = 1, back-substitution over the leading n-1 rows.
  const zr = new Float64Array(n);
  const zi = new Float64Array(n);
  zr[n - 1] = 1;
  for (let i = n - 2; i >= 0; i--) {
    let sr = 0;
    let sI = 0;
    for (let j = i + 1; j < n; j++) {
      const ur = re[i * n + j];
      const ui = im[i * n + j];
      sr -= ur * zr[j] - ui * zi[j];
      sI -= ur * zi[j] + ui * zr[j];
    }
    const pr = re[i * n + i];
    const pi = im[i * n + i];
    const den = pr * pr + pi * pi;
    zr[i] = den === 0 ? 0 : (sr * pr + sI * pi) / den;
    zi[i] = den === 0 ? 0 : (sI * pr - sr * pi) / den;
  }
  const rightRe = new Float64Array(n);
  const rightIm = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    rightRe[colPerm[k]] = zr[k];
    rightIm[colPerm[k]] = zi[k];
  }
  // Left: wᵀU = 0 has w = e_last; then Lᵀ u = w for u = Pψ (unit lower L, so back-substitution on Lᵀ).
  const ur = new Float64Array(n);
  const ui = new Float64Array(n);
  ur[n - 1] = 1;
  for (let i = n - 2; i >= 0; i--) {
    let sr = 0;
    let sI = 0;
    for (let j = i + 1; j < n; j++) {
      const lr = re[j * n + i];
      const li = im[j * n + i];
      sr -= lr * ur[j] - li * ui[j];
      sI -= lr * ui[j] + li * ur[j];
    }
    ur[i] = sr;
    ui[i] = sI;
  }
  const leftRe = new Float64Array(n);
  const leftIm = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    leftRe[rowPerm[k]] = ur[k];
    leftIm[rowPerm[k]] = ui[k];
  }
  return { rightRe, rightIm, leftRe, leftIm };
}

/**
 * |last pivot| of the complete-pivoting elimination of (re, im), done in place (the inputs are
 * overwritten): the same pivots and arithmetic as complexLuFactor, without copies, permutations or the
 * multipliers, for callers that only judge how singular the matrix is. `real` skips the imaginary parts
 * (which must then be all zero).
 */
export function lastPivotInPlace(re: Float64Array, im: Float64Array, n: number, real: boolean): number {
  if (n === 0) return 1;
  if (real) return lastPivotRealInPlace(re, n);
  for (let k = 0; k < n; k++) {
    let bi = k;
    let bj = k;
    let best = -1;
    for (let i = k; i < n; i++) {
      const row = i * n;
      for (let j = k; j < n; j++) {
        const m = real ? Math.abs(re[row + j]) : Math.abs(re[row + j]) + Math.abs(im[row + j]);
        if (m > best) {
          best = m;
          bi = i;
          bj = j;
        }
      }
    }
    if (bi !== k) {
      for (let j = k; j < n; j++) {
        swap(re, k * n + j, bi * n + j);
        if (!real) swap(im, k * n + j, bi * n + j);
      }
    }
    if (bj !== k) {
      for (let i = k; i < n; i++) {
        swap(re, i * n + k, i * n + bj);
        if (!real) swap(im, i * n + k, i * n + bj);
      }
    }
    const pr = re[k * n + k];
    const pi = real ? 0 : im[k * n + k];
    if (k === n - 1) return Math.sqrt(pr * pr + pi * pi);
    if (pr === 0 && pi === 0) continue;
    if (real) {
      for (let i = k + 1; i < n; i++) {
        const a = re[i * n + k];
        if (a === 0) continue;
        const f = a / pr;
        for (let j = k + 1; j < n; j++) re[i * n + j] -= f * re[k * n + j];
      }
      continue;
    }
    const den = pr * pr + pi * pi;
    for (let i = k + 1; i < n; i++) {
      const ar = re[i * n + k];
      const ai = im[i * n + k];
      if (ar === 0 && ai === 0) continue;
      const fr = (ar * pr + ai * pi) / den;
      const fi = (ai * pr - ar * pi) / den;
      for (let j = k + 1; j < n; j++) {
        const ur = re[k * n + j];
        const ui = im[k * n + j];
        re[i * n + j] -= fr * ur - fi * ui;
        im[i * n + j] -= fr * ui + fi * ur;
      }
    }
  }
  return 1;
}

/** lastPivotInPlace for a real matrix: the same pivots and arithmetic on the real parts alone. */
function lastPivotRealInPlace(a: Float64Array, n: number): number {
  for (let k = 0; k < n; k++) {
    let bi = k;
    let bj = k;
    let best = -1;
    for (let i = k; i < n; i++) {
      const row = i * n;
      for (let j = k; j < n; j++) {
        const m = Math.abs(a[row + j]);
        if (m > best) {
          best = m;
          bi = i;
          bj = j;
        }
      }
    }
    if (bi !== k) for (let j = k; j < n; j++) swap(a, k * n + j, bi * n + j);
    if (bj !== k) for (let i = k; i < n; i++) swap(a, i * n + k, i * n + bj);
    const p = a[k * n + k];
    if (k === n - 1) return Math.abs(p);
    if (p === 0) continue;
    const pivotRow = k * n;
    for (let i = k + 1; i < n; i++) {
      const row = i * n;
      const x = a[row + k];
      if (x === 0) continue;
      const f = x / p;
      for (let j = k + 1; j < n; j++) a[row + j] -= f * a[pivotRow + j];
    }
  }
  return 1;
}

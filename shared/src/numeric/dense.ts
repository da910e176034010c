// Small dense real matrices stored row-major in Float64Array (entry (i, j) of an n×m matrix at i*m + j).

/** An n×n identity. */
export function identity(n: number): Float64Array {
  const out = new Float64Array(n * n);
  for (let i = 0; i < n; i++) out[i * n + i] = 1;
  return out;
}

/** out = a·b for a (n×k) and b (k×m). */
export function multiply(a: Float64Array, b: Float64Array, n: number, k: number, m: number): Float64Array {
  const out = new Float64Array(n * m);
  for (let i = 0; i < n; i++) {
    for (let p = 0; p < k; p++) {
      const aip = a[i * k + p];
      if (aip === 0) continue;
      const bRow = p * m;
      const oRow = i * m;
      for (let j = 0; j < m; j++) out[oRow + j] += aip * b[bRow + j];
    }
  }
  return out;
}

export function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

/** Euclidean norm without overflow for the magnitudes met here. */
export function norm2(a: Float64Array): number {
  let scale = 0;
  for (let i = 0; i < a.length; i++) scale = Math.max(scale, Math.abs(a[i]));
  if (scale === 0) return 0;
  let s = 0;
  for (let i = 0; i < a.length; i++) {
    const v = a[i] / scale;
    s += v * v;
  }
  return scale * Math.sqrt(s);
}

/** Largest absolute row sum (the ∞-norm). */
export function normInf(a: Float64Array, n: number, m: number): number {
  let best = 0;
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let j = 0; j < m; j++) s += Math.abs(a[i * m + j]);
    if (s > best) best = s;
  }
  return best;
}

/** Frobenius norm. */
export function normFrobenius(a: Float64Array): number {
  return norm2(a);
}

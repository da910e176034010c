// Matrix exponential by scaling and squaring with a diagonal Padé approximant (degree 6, norm scaled below
// 1/2: Moler & Van Loan, "Nineteen dubious ways…", SIAM Review 2003, method 3 — from memory).
import { identity, multiply, normInf } from './dense';
import { luFactor, luSolveMatrix } from './luReal';
import { OutOfRangeError, requireFinite } from './rangeError';

const Q = 6;

/**
 * A finite ∞-norm is below 2^1024, so scaling it below 1/2 takes at most 1026 halvings; the bound makes
 * the squaring loop finite whatever the input.
 */
export const MAX_SQUARINGS = 1026;

/**
 * e^A for an n×n matrix. Throws OutOfRangeError when A has a non-finite entry, its norm overflows, or the
 * exponential itself overflows (a growth faster than double precision holds).
 */
export function expm(a: Float64Array, n: number): Float64Array {
  if (n === 0) return new Float64Array(0);
  requireFinite(a, 'the matrix to exponentiate');
  const norm = normInf(a, n, n);
  if (!Number.isFinite(norm)) throw new OutOfRangeError('the matrix to exponentiate has an overflowing norm');
  const e = norm > 0 ? Math.max(0, Math.floor(Math.log2(norm)) + 2) : 0;
  if (e > MAX_SQUARINGS) throw new OutOfRangeError('the matrix to exponentiate needs too many squarings');
  const scale = 2 ** -e;
  const x0 = new Float64Array(a.length);
  for (let i = 0; i < a.length; i++) x0[i] = a[i] * scale;
  let x: Float64Array = x0;
  let c = 0.5;
  const num = identity(n);
  const den = identity(n);
  for (let i = 0; i < a.length; i++) {
    num[i] += c * x0[i];
    den[i] -= c * x0[i];
  }
  let positive = true;
  for (let k = 2; k <= Q; k++) {
    c = (c * (Q - k + 1)) / (k * (2 * Q - k + 1));
    x = multiply(x0, x, n, n, n);
    for (let i = 0; i < a.length; i++) {
      num[i] += c * x[i];
      den[i] += (positive ? c : -c) * x[i];
    }
    positive = !positive;
  }
  let result: Float64Array = luSolveMatrix(luFactor(den, n), num, n);
  for (let k = 0; k < e; k++) result = multiply(result, result, n, n, n);
  requireFinite(result, 'the matrix exponential');
  return result;
}

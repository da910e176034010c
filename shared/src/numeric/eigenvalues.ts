// Eigenvalues of a general real matrix: balancing, orthogonal reduction to upper Hessenberg form, then the
// Francis double-shift QR iteration (the classic dense nonsymmetric method; Wilkinson & Reinsch,
// Handbook for Automatic Computation vol. II, 1971 — from memory).
import { ScratchPool } from './workspace';

export interface Eigenvalues {
  readonly re: Float64Array;
  readonly im: Float64Array;
}

export class EigenvalueFailure extends Error {}

const MAX_BALANCE_STEPS = 500;

const ortPool = new ScratchPool();
const workPool = new ScratchPool();

/** Scale rows and columns by powers of two so that row and column norms are comparable. */
export function balance(a: Float64Array, n: number): void {
  const radix = 2;
  const sqrdx = radix * radix;
  let done = false;
  let guard = 0;
  while (!done && guard++ < 200) {
    done = true;
    for (let i = 0; i < n; i++) {
      let c = 0;
      let r = 0;
      for (let j = 0; j < n; j++) {
        if (j === i) continue;
        c += Math.abs(a[j * n + i]);
        r += Math.abs(a[i * n + j]);
      }
      if (c === 0 || r === 0 || !Number.isFinite(c + r)) continue;
      let g = r / radix;
      let f = 1;
      const s = c + r;
      // Each step moves c by a factor of 4 and f by 2; the count bounds both loops and keeps f and 1/f
      // normal numbers (within 2^±500), so the scaling below never multiplies by 0 or ∞. A balance cut
      // short is still a similarity, only a less even one.
      for (let k = 0; c < g && k < MAX_BALANCE_STEPS; k++) {
        f *= radix;
        c *= sqrdx;
      }
      g = r * radix;
      for (let k = 0; c > g && k < MAX_BALANCE_STEPS; k++) {
        f /= radix;
        c /= sqrdx;
      }
      if ((c + r) / f < 0.95 * s) {
        done = false;
        const inv = 1 / f;
        for (let j = 0; j < n; j++) a[i * n + j] *= inv;
        for (let j = 0; j < n; j++) a[j * n + i] *= f;
      }
    }
  }
}

/** Householder reduction to upper Hessenberg form, in place. */
export function hessenberg(h: Float64Array, n: number): void {
  // Every entry of ort that is read is written first in the same step.
  const ort = ortPool.get(n);
  const high = n - 1;
  for (let m = 1; m <= high - 1; m++) {
    let scale = 0;
    for (let i = m; i <= high; i++) scale += Math.abs(h[i * n + m - 1]);
    if (scale === 0) continue;
    let hh = 0;
    for (let i = high; i >= m; i--) {
      ort[i] = h[i * n + m - 1] / scale;
      hh += ort[i] * ort[i];
    }
    let g = Math.sqrt(hh);
    if (ort[m] > 0) g = -g;
    hh -= ort[m] * g;
    ort[m] -= g;
    for (let j = m; j < n; j++) {
      let f = 0;
      for (let i = high; i >= m; i--) f += ort[i] * h[i * n + j];
      f /= hh;
      for (let i = m; i <= high; i++) h[i * n + j] -= f * ort[i];
    }
    for (let i = 0; i <= high; i++) {
      let f = 0;
      for (let j = high; j >= m; j--) f += ort[j] * h[i * n + j];
      f /= hh;
      for (let j = m; j <= high; j++) h[i * n + j] -= f * ort[j];
    }
    ort[m] *= scale;
    h[m * n + m - 1] = scale * g;
    for (let i = m + 1; i <= high; i++) h[i * n + m - 1] = 0;
  }
}

/** Eigenvalues of an upper Hessenberg matrix (destroyed) by the shifted double QR iteration. */
export function hessenbergEigenvalues(H: Float64Array, nn: number): Eigenvalues {
  const d = new Float64Array(nn);
  const e = new Float64Array(nn);
  const eps = 2.220446049250313e-16;
  let n = nn - 1;
  const low = 0;
  let exshift = 0;
  let p = 0;
  let q = 0;
  let r = 0;
  let s = 0;
  let z = 0;
  let w: number;
  let x: number;
  let y: number;
  let norm = 0;
  for (let i = 0; i < nn; i++) {
    for (let j = Math.max(i - 1, 0); j < nn; j++) norm += Math.abs(H[i * nn + j]);
  }
  let iter = 0;
  let total = 0;
  const maxTotal = 100 * Math.max(nn, 1);
  while (n >= low) {
    let l = n;
    while (l > low) {
      s = Math.abs(H[(l - 1) * nn + l - 1]) + Math.abs(H[l * nn + l]);
      if (s === 0) s = norm;
      if (Math.abs(H[l * nn + l - 1]) < eps * s) break;
      l--;
    }
    if (l === n) {
      H[n * nn + n] += exshift;
      d[n] = H[n * nn + n];
      e[n] = 0;
      n--;
      iter = 0;
    } else if (l === n - 1) {
      w = H[n * nn + n - 1] * H[(n - 1) * nn + n];
      p = (H[(n - 1) * nn + n - 1] - H[n * nn + n]) / 2;
      q = p * p + w;
      z = Math.sqrt(Math.abs(q));
      H[n * nn + n] += exshift;
      H[(n - 1) * nn + n - 1] += exshift;
      x = H[n * nn + n];
      if (q >= 0) {
        z = p >= 0 ? p + z : p - z;
        d[n - 1] = x + z;
        d[n] = d[n - 1];
        if (z !== 0) d[n] = x - w / z;
        e[n - 1] = 0;
        e[n] = 0;
      } else {
        d[n - 1] = x + p;
        d[n] = x + p;
        e[n - 1] = z;
        e[n] = -z;
      }
      n -= 2;
      iter = 0;
    } else {
      if (++total > maxTotal) throw new EigenvalueFailure('QR iteration did not converge');
      x = H[n * nn + n];
      y = 0;
      w = 0;
      if (l < n) {
        y = H[(n - 1) * nn + n - 1];
        w = H[n * nn + n - 1] * H[(n - 1) * nn + n];
      }
      // Exceptional shifts break the rare cycles of the standard shift.
      if (iter === 10) {
        exshift += x;
        for (let i = low; i <= n; i++) H[i * nn + i] -= x;
        s = Math.abs(H[n * nn + n - 1]) + Math.abs(H[(n - 1) * nn + n - 2]);
        x = y = 0.75 * s;
        w = -0.4375 * s * s;
      }
      if (iter === 30) {
        s = (y - x) / 2;
        s = s * s + w;
        if (s > 0) {
          s = Math.sqrt(s);
          if (y < x) s = -s;
          s = x - w / ((y - x) / 2 + s);
          for (let i = low; i <= n; i++) H[i * nn + i] -= s;
          exshift += s;
          x = y = w = 0.964;
        }
      }
      iter++;
      let m = n - 2;
      while (m >= l) {
        z = H[m * nn + m];
        r = x - z;
        s = y - z;
        p = (r * s - w) / H[(m + 1) * nn + m] + H[m * nn + m + 1];
        q = H[(m + 1) * nn + m + 1] - z - r - s;
        r = H[(m + 2) * nn + m + 1];
        s = Math.abs(p) + Math.abs(q) + Math.abs(r);
        p /= s;
        q /= s;
        r /= s;
        if (m === l) break;
        if (
          Math.abs(H[m * nn + m - 1]) * (Math.abs(q) + Math.abs(r)) <
          eps *
            (Math.abs(p) *
              (Math.abs(H[(m - 1) * nn + m - 1]) + Math.abs(z) + Math.abs(H[(m + 1) * nn + m + 1])))
        ) {
          break;
        }
        m--;
      }
      for (let i = m + 2; i <= n; i++) {
        H[i * nn + i - 2] = 0;
        if (i > m + 2) H[i * nn + i - 3] = 0;
      }
      for (let k = m; k <= n - 1; k++) {
        const notlast = k !== n - 1;
        if (k !== m) {
          p = H[k * nn + k - 1];
          q = H[(k + 1) * nn + k - 1];
          r = notlast ? H[(k + 2) * nn + k - 1] : 0;
          x = Math.abs(p) + Math.abs(q) + Math.abs(r);
          if (x === 0) continue;
          p /= x;
          q /= x;
          r /= x;
        }
        s = Math.sqrt(p * p + q * q + r * r);
        if (p < 0) s = -s;
        if (s !== 0) {
          if (k !== m) H[k * nn + k - 1] = -s * x;
          else if (l !== m) H[k * nn + k - 1] = -H[k * nn + k - 1];
          p += s;
          x = p / s;
          y = q / s;
          z = r / s;
          q /= p;
          r /= p;
          for (let j = k; j < nn; j++) {
            p = H[k * nn + j] + q * H[(k + 1) * nn + j];
            if (notlast) {
              p += r * H[(k + 2) * nn + j];
              H[(k + 2) * nn + j] -= p * z;
            }
            H[k * nn + j] -= p * x;
            H[(k + 1) * nn + j] -= p * y;
          }
          const top = Math.min(n, k + 3);
          for (let i = 0; i <= top; i++) {
            p = x * H[i * nn + k] + y * H[i * nn + k + 1];
            if (notlast) {
              p += z * H[i * nn + k + 2];
              H[i * nn + k + 2] -= p * r;
            }
            H[i * nn + k] -= p;
            H[i * nn + k + 1] -= p * q;
          }
        }
      }
    }
  }
  return { re: d, im: e };
}

/** Eigenvalues of a general real n×n matrix (the input is not modified). */
export function eigenvalues(a: Float64Array, n: number): Eigenvalues {
  if (n === 0) return { re: new Float64Array(0), im: new Float64Array(0) };
  for (let i = 0; i < a.length; i++) {
    if (!Number.isFinite(a[i])) throw new EigenvalueFailure('matrix has a non-finite entry');
  }
  // The reduced matrix is scratch; only the eigenvalue arrays leave this function.
  const h = workPool.get(n * n);
  h.set(a.length === n * n ? a : a.subarray(0, n * n));
  balance(h, n);
  hessenberg(h, n);
  return hessenbergEigenvalues(h, n);
}

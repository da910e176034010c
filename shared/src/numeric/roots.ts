// Scalar root finding and maximisation on one variable.

/**
 * Brent's method (Brent, Algorithms for Minimization without Derivatives, 1973, ch. 4) for f(a)·f(b) ≤ 0.
 * Returns the root to within `tol` in x.
 */
export function brentRoot(
  f: (x: number) => number,
  a: number,
  b: number,
  fa: number = f(a),
  fb: number = f(b),
  tol = 1e-12,
  maxIter = 100,
): number {
  if (fa === 0) return a;
  if (fb === 0) return b;
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let iter = 0; iter < maxIter; iter++) {
    if ((fb > 0 && fc > 0) || (fb < 0 && fc < 0)) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol1 = 2 * 2.220446049250313e-16 * Math.abs(b) + 0.5 * tol;
    const xm = 0.5 * (c - b);
    if (Math.abs(xm) <= tol1 || fb === 0) return b;
    if (Math.abs(e) >= tol1 && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * xm * s;
        q = 1 - s;
      } else {
        const qq = fa / fc;
        const r = fb / fc;
        p = s * (2 * xm * qq * (qq - r) - (b - a) * (r - 1));
        q = (qq - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      p = Math.abs(p);
      if (2 * p < Math.min(3 * xm * q - Math.abs(tol1 * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = xm;
        e = d;
      }
    } else {
      d = xm;
      e = d;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol1 ? d : xm >= 0 ? tol1 : -tol1;
    fb = f(b);
  }
  return b;
}

/** Golden-section search for a maximum of a unimodal f on [a, b]. */
export function goldenMax(f: (x: number) => number, a: number, b: number, tol = 1e-9, maxIter = 200) {
  const g = (Math.sqrt(5) - 1) / 2;
  let x1 = b - g * (b - a);
  let x2 = a + g * (b - a);
  let f1 = f(x1);
  let f2 = f(x2);
  for (let i = 0; i < maxIter && Math.abs(b - a) > tol * (Math.abs(a) + Math.abs(b) + 1e-300); i++) {
    if (f1 < f2) {
      a = x1;
      x1 = x2;
      f1 = f2;
      x2 = a + g * (b - a);
      f2 = f(x2);
    } else {
      b = x2;
      x2 = x1;
      f2 = f1;
      x1 = b - g * (b - a);
      f1 = f(x1);
    }
  }
  return f1 > f2 ? { x: x1, value: f1 } : { x: x2, value: f2 };
}

/**
 * The least value of f on [a, b] without derivatives, by Brent's method (Brent, Algorithms for Minimization
 * without Derivatives, 1973, ch. 5): golden-section steps, replaced by parabolic interpolation through the
 * three best points wherever that stays inside the bracket and shrinks fast enough. Near a smooth minimum
 * the parabola lands close to it at once, so it needs a fraction of golden section's evaluations where each
 * one is costly (an analysis, an exact propagation in time). x is located to within about
 * absTol + relTol·|x|; f is called at most `maxCalls` times.
 */
export function brentMin(
  f: (x: number) => number,
  a: number,
  b: number,
  absTol: number,
  relTol = 1e-12,
  maxCalls = 40,
): { x: number; value: number } {
  const GOLDEN = (3 - Math.sqrt(5)) / 2;
  let x = a + GOLDEN * (b - a);
  let w = x;
  let v = x;
  let fx = f(x);
  let fw = fx;
  let fv = fx;
  let d = 0;
  let e = 0;
  for (let calls = 1; calls < maxCalls; calls++) {
    const m = (a + b) / 2;
    const tol1 = absTol / 2 + relTol * Math.abs(x) + 1e-300;
    const tol2 = 2 * tol1;
    if (Math.abs(x - m) <= tol2 - (b - a) / 2) break;
    let parabolic = false;
    if (Math.abs(e) > tol1) {
      // The parabola through (v, fv), (w, fw), (x, fx): its vertex is x + p/q.
      const r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      else q = -q;
      // Accept the step only if it falls inside the interval and shrinks faster than the one before last.
      if (Math.abs(p) < Math.abs(0.5 * q * e) && p > q * (a - x) && p < q * (b - x)) {
        e = d;
        d = p / q;
        const u = x + d;
        if (u - a < tol2 || b - u < tol2) d = x < m ? tol1 : -tol1;
        parabolic = true;
      }
    }
    if (!parabolic) {
      e = x < m ? b - x : a - x;
      d = GOLDEN * e;
    }
    const u = Math.abs(d) >= tol1 ? x + d : x + (d > 0 ? tol1 : -tol1);
    const fu = f(u);
    if (fu <= fx) {
      if (u < x) b = x;
      else a = x;
      v = w;
      fv = fw;
      w = x;
      fw = fx;
      x = u;
      fx = fu;
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu <= fw || w === x) {
        v = w;
        fv = fw;
        w = u;
        fw = fu;
      } else if (fu <= fv || v === x || v === w) {
        v = u;
        fv = fu;
      }
    }
  }
  return { x, value: fx };
}

/**
 * The greatest value of f on [a, b] by brentMin: x to about tol·|x|, plus tol/1000 of the bracket for x
 * near 0 (the relative tolerance of goldenMax, with far fewer calls).
 */
export function brentMax(f: (x: number) => number, a: number, b: number, tol = 1e-9, maxCalls = 100) {
  const r = brentMin((x) => -f(x), a, b, 2e-3 * tol * Math.abs(b - a), tol, maxCalls);
  return { x: r.x, value: -r.value };
}

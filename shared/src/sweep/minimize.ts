// The least value of a function on an interval, without derivatives: golden-section steps combined with
// parabolic interpolation through the three best points (R. P. Brent, "Algorithms for Minimization
// without Derivatives", 1973, ch. 5). Near a smooth minimum the parabola lands close to it at once, so a
// sweep's refinement between two samples needs a handful of analyses where golden section alone needs
// about three times as many for the same width.

const GOLDEN = (3 - Math.sqrt(5)) / 2;

/**
 * The x in [a, b] where f is least, located to within about `tol` (absolute), and f there. Each call of f
 * may be an analysis: f is called at most `maxCalls` times.
 */
export function minimizeOnInterval(
  f: (x: number) => number,
  a: number,
  b: number,
  tol: number,
  maxCalls = 40,
): { x: number; value: number } {
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
    const tol1 = tol / 2 + 1e-12 * Math.abs(x);
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

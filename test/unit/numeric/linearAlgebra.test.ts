// The dense routines against general-purpose libraries: eigenvalues of random general matrices against
// ml-matrix's EigenvalueDecomposition, complex LU solves against mathjs `lusolve`, and the scalar root
// finders on functions whose roots and maxima are known in closed form.
import fc from 'fast-check';
import * as math from 'mathjs';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { complexLuFactor, complexLuSolve } from '../../../shared/src/numeric/complexLu';
import { balance, eigenvalues, EigenvalueFailure } from '../../../shared/src/numeric/eigenvalues';
import { brentMax, brentRoot, goldenMax } from '../../../shared/src/numeric/roots';

// Unbiased entries: fast-check's default bias favours zeros and repeats, which make matrices defective,
// and a k-fold defective eigenvalue is only determined to ε^(1/k) by any method.
const square = (lo: number, hi: number, maxN = 8) =>
  fc
    .integer({ min: 1, max: maxN })
    .chain((n) =>
      fc.tuple(
        fc.constant(n),
        fc.noBias(
          fc.array(fc.double({ min: lo, max: hi, noNaN: true }), { minLength: n * n, maxLength: n * n }),
        ),
      ),
    );

const rows = (a: ArrayLike<number>, n: number) =>
  Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => a[i * n + j]!));

type Root = { re: number; im: number };
const sorted = (r: Root[]) => [...r].sort((x, y) => x.re - y.re || x.im - y.im);

/** Greedy matching of two root sets (every root of one within `tol` of a distinct root of the other). */
function expectSameRoots(ours: Root[], ref: Root[], tol: number) {
  expect(ours.length).toBe(ref.length);
  const left = sorted(ref);
  for (const r of sorted(ours)) {
    let best = -1;
    let dist = Infinity;
    left.forEach((q, k) => {
      const d = Math.hypot(r.re - q.re, r.im - q.im);
      if (d < dist) [best, dist] = [k, d];
    });
    expect(dist).toBeLessThanOrEqual(tol);
    left.splice(best, 1);
  }
}

describe('eigenvalues of general real matrices', () => {
  it('match ml-matrix EigenvalueDecomposition on random matrices (sorted, matched)', () => {
    fc.assert(
      fc.property(square(-10, 10), ([n, values]) => {
        const a = Float64Array.from(values);
        const e = eigenvalues(a, n);
        const ours = Array.from(e.re, (re, i) => ({ re, im: e.im[i]! }));
        // Source of the check values: ml-matrix EigenvalueDecomposition.
        const dec = new EigenvalueDecomposition(new Matrix(rows(a, n)));
        const ref = dec.realEigenvalues.map((re, i) => ({ re, im: dec.imaginaryEigenvalues[i]! }));
        const scale = Math.max(1, ...values.map(Math.abs)) * n;
        // Eigenvalues of a defective matrix are only O(√ε) well determined; random matrices are not
        // defective, so a loose absolute bound relative to the norm is ample.
        expectSameRoots(ours, ref, 1e-6 * scale);
      }),
      { numRuns: 300 },
    );
  });

  it('match ml-matrix on graded matrices spanning many decades (state matrices of amplifiers)', () => {
    fc.assert(
      fc.property(
        square(-1, 1, 6),
        fc.array(fc.integer({ min: -12, max: 12 }), { minLength: 6, maxLength: 6 }),
        ([n, values], exps) => {
          // D·M·D⁻¹ has the eigenvalues of M: a similarity that spreads the entries over decades.
          const d = exps.slice(0, n).map((k) => 10 ** k);
          const a = Float64Array.from(values, (v, idx) => (v * d[Math.floor(idx / n)]!) / d[idx % n]!);
          const e = eigenvalues(a, n);
          const ours = Array.from(e.re, (re, i) => ({ re, im: e.im[i]! }));
          // Source: ml-matrix on the undistorted M (the similarity leaves the spectrum unchanged).
          const dec = new EigenvalueDecomposition(new Matrix(rows(values, n)));
          const ref = dec.realEigenvalues.map((re, i) => ({ re, im: dec.imaginaryEigenvalues[i]! }));
          expectSameRoots(ours, ref, 1e-6 * n);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('give the companion matrix of (s+1)(s+2)(s+3) its roots −1, −2, −3 (closed form)', () => {
    // s³ + 6s² + 11s + 6: companion matrix in the first-row form.
    const e = eigenvalues(Float64Array.of(-6, -11, -6, 1, 0, 0, 0, 1, 0), 3);
    expectSameRoots(
      Array.from(e.re, (re, i) => ({ re, im: e.im[i]! })),
      [-1, -2, -3].map((re) => ({ re, im: 0 })),
      1e-12,
    );
  });

  it('refuse a non-finite entry and stop balancing at the ends of double range', () => {
    expect(() => eigenvalues(Float64Array.of(NaN, 0, 0, 1), 2)).toThrow(EigenvalueFailure);
    // Row and column sums that overflow (1e308 + 1e308) once kept the balancing loop dividing ∞ by 4.
    const huge = Float64Array.of(1e308, 1e308, 1e308, 1e-308, 1e308, 1e308, 1e-308, 1e-308, 1e308);
    balance(huge, 3);
    const tiny = Float64Array.of(0, 5e-324, 1e308, 0);
    balance(tiny, 2);
    for (const v of tiny) expect(Number.isNaN(v)).toBe(false);
  });
});

describe('complex LU with complete pivoting', () => {
  it('solves random complex systems as mathjs lusolve does', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 7 }).chain((n) =>
          fc.tuple(
            fc.constant(n),
            fc.array(fc.double({ min: -5, max: 5, noNaN: true }), {
              minLength: 2 * n * n,
              maxLength: 2 * n * n,
            }),
            fc.array(fc.double({ min: -5, max: 5, noNaN: true }), { minLength: 2 * n, maxLength: 2 * n }),
          ),
        ),
        ([n, m, b]) => {
          const re = Float64Array.from(m.slice(0, n * n));
          const im = Float64Array.from(m.slice(n * n));
          // Diagonal dominance keeps the random systems well conditioned, so both solvers agree closely.
          for (let i = 0; i < n; i++) re[i * n + i] += 10 * n;
          const bRe = Float64Array.from(b.slice(0, n));
          const bIm = Float64Array.from(b.slice(n));
          const [xr, xi] = complexLuSolve(complexLuFactor(re, im, n), bRe, bIm);
          // Source of the check values: mathjs lusolve on the same complex system.
          const A = Array.from({ length: n }, (_, i) =>
            Array.from({ length: n }, (_, j) => math.complex(re[i * n + j]!, im[i * n + j]!)),
          );
          const rhs = Array.from({ length: n }, (_, i) => [math.complex(bRe[i]!, bIm[i]!)]);
          const x = (math.lusolve(A, rhs) as unknown as math.Complex[][]).map((r) => math.complex(r[0]!));
          for (let i = 0; i < n; i++) {
            expect(Math.abs(xr[i]! - x[i]!.re)).toBeLessThan(1e-10);
            expect(Math.abs(xi[i]! - x[i]!.im)).toBeLessThan(1e-10);
          }
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe('scalar root finding and maximisation', () => {
  it('brentRoot finds √2 of x² − 2, π of sin x on [3, 4], and ln 5 of eˣ − 5 (closed forms)', () => {
    expect(Math.abs(brentRoot((x) => x * x - 2, 0, 2) - Math.SQRT2)).toBeLessThan(1e-11);
    expect(Math.abs(brentRoot(Math.sin, 3, 4) - Math.PI)).toBeLessThan(1e-11);
    expect(Math.abs(brentRoot((x) => Math.exp(x) - 5, 0, 3) - Math.log(5))).toBeLessThan(1e-11);
  });

  it('brentRoot finds the root of random cubics (x − r)(x² + 1) in a bracket around r', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -100, max: 100, noNaN: true }),
        fc.double({ min: 0.1, max: 50, noNaN: true }),
        (r, w) => {
          // The only real root is r (x² + 1 > 0).
          const x = brentRoot((t) => (t - r) * (t * t + 1), r - w, r + 2 * w, undefined, undefined, 1e-12);
          expect(Math.abs(x - r)).toBeLessThan(1e-9 * Math.max(1, Math.abs(r)));
        },
      ),
      { numRuns: 300 },
    );
  });

  it('brentRoot returns in bounded steps on a function that is NaN or has no sign change', () => {
    expect(() => brentRoot(() => NaN, 0, 1)).not.toThrow();
    expect(() => brentRoot((x) => x * x + 1, -1, 1)).not.toThrow();
  });

  it('goldenMax finds the maximum of −(x − c)² + h and of x·e^(−x) at x = 1 (closed forms)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -10, max: 10, noNaN: true }),
        fc.double({ min: -5, max: 5, noNaN: true }),
        (c, h) => {
          const m = goldenMax((x) => h - (x - c) ** 2, c - 7, c + 11, 1e-12);
          expect(Math.abs(m.x - c)).toBeLessThan(1e-6 * Math.max(1, Math.abs(c)));
          expect(Math.abs(m.value - h)).toBeLessThan(1e-10);
        },
      ),
      { numRuns: 200 },
    );
    const m = goldenMax((x) => x * Math.exp(-x), 0, 5, 1e-12);
    expect(Math.abs(m.x - 1)).toBeLessThan(1e-6);
    expect(Math.abs(m.value - Math.exp(-1))).toBeLessThan(1e-12);
    expect(() => goldenMax(() => NaN, 0, 1)).not.toThrow();
  });

  it('brentMax finds the same maxima, x·e^(−x) at 1, sin at π/2 and a damped ringing peak, in few evaluations', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -10, max: 10, noNaN: true }),
        fc.double({ min: -5, max: 5, noNaN: true }),
        (c, h) => {
          const m = brentMax((x) => h - (x - c) ** 2, c - 7, c + 11, 1e-12);
          expect(Math.abs(m.x - c)).toBeLessThan(1e-6 * Math.max(1, Math.abs(c)));
          expect(Math.abs(m.value - h)).toBeLessThan(1e-10);
        },
      ),
      { numRuns: 200 },
    );
    let calls = 0;
    const m = brentMax(
      (x) => {
        calls++;
        return x * Math.exp(-x);
      },
      0,
      5,
      1e-10,
    );
    expect(Math.abs(m.x - 1)).toBeLessThan(1e-7);
    expect(Math.abs(m.value - Math.exp(-1))).toBeLessThan(1e-14);
    expect(calls).toBeLessThan(25); // golden section needs about 48 for the same bracket and tolerance
    expect(Math.abs(brentMax(Math.sin, 0, 3, 1e-12).x - Math.PI / 2)).toBeLessThan(1e-8);
    // 1 − e^(−ζωt)(cos ωd·t + ζ/√(1−ζ²)·sin ωd·t), ζ = 0.3: its first peak is at π/ωd with overshoot
    // e^(−ζπ/√(1−ζ²)) (second-order step response, any control text).
    const z = 0.3;
    const wd = Math.sqrt(1 - z * z);
    const y = (t: number) => 1 - Math.exp(-z * t) * (Math.cos(wd * t) + (z / wd) * Math.sin(wd * t));
    const peak = brentMax(y, 2, 5, 1e-12);
    expect(Math.abs(peak.x - Math.PI / wd)).toBeLessThan(1e-7);
    expect(Math.abs(peak.value - 1 - Math.exp((-z * Math.PI) / wd))).toBeLessThan(1e-14);
    expect(() => brentMax(() => NaN, 0, 1)).not.toThrow();
  });
});

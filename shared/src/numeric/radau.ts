// One step of the three-stage Radau IIA method for M·y' = f(y), M constant and possibly singular (an
// index-1 differential-algebraic system): order 5 at the step's end for the differential and the algebraic
// components alike, L-stable and stiffly accurate (Hairer & Wanner, Solving Ordinary Differential Equations
// II, §IV.5 and §VI.1 — coefficients from memory; a test checks the stability function against the (3,2)
// Padé approximant of e^z and the order on a known solution). The stage equations are solved by Newton's
// method on the whole 3n system, dense: the networks here have a few to about fifteen nodes.
import { luFactor, luSolve } from './luReal';

export interface ImplicitSystem {
  readonly n: number;
  /** n×n, row-major. */
  readonly M: Float64Array;
  /** f(y) into `out`. */
  f(y: Float64Array, out: Float64Array): void;
  /** ∂f/∂y at y into `out` (n×n, row-major). */
  jacobian(y: Float64Array, out: Float64Array): void;
}

const S6 = Math.sqrt(6);
/** Collocation points. */
export const RADAU_C = [(4 - S6) / 10, (4 + S6) / 10, 1] as const;
/** The Butcher matrix; its last row is the weights (stiffly accurate). */
export const RADAU_A = [
  [(88 - 7 * S6) / 360, (296 - 169 * S6) / 1800, (-2 + 3 * S6) / 225],
  [(296 + 169 * S6) / 1800, (88 + 7 * S6) / 360, (-2 - 3 * S6) / 225],
  [(16 - S6) / 36, (16 + S6) / 36, 1 / 9],
] as const;

/**
 * Weights of the derivative at the step's end of the collocation polynomial through (0, y0), (c_j, Y_j):
 * y'(t0 + h) ≈ Σ w_j·Y_j / h (j = 0 for y0). Lagrange's formula differentiated at 1.
 */
export const END_SLOPE: readonly number[] = (() => {
  const x = [0, ...RADAU_C];
  return x.map((xj, j) => {
    let s = 0;
    for (let m = 0; m < x.length; m++) {
      if (m === j) continue;
      let p = 1 / (xj - x[m]!);
      for (let l = 0; l < x.length; l++) if (l !== j && l !== m) p *= (1 - x[l]!) / (xj - x[l]!);
      s += p;
    }
    return s;
  });
})();

export interface RadauStep {
  /** The solution at the step's end. */
  readonly y: Float64Array;
  /** The three stage values Y_j (the last equals `y`). */
  readonly stages: readonly Float64Array[];
}

const MAX_NEWTON = 12;
/** A few ulps: Newton's update cannot resolve a stage value more finely. */
const ROUNDOFF = 1e-14;

/**
 * One step of length h from y0, or undefined when Newton's method does not converge (the caller shortens
 * the step). `scale` weighs each component (the error-control scale); Newton stops when its update is below
 * `newtonTol` in that weighted norm.
 */
export function radauStep(
  sys: ImplicitSystem,
  y0: Float64Array,
  h: number,
  scale: Float64Array,
  newtonTol: number,
): RadauStep | undefined {
  return radauStepper(sys)(y0, h, scale, newtonTol);
}

/**
 * `radauStep` for one system, with its scratch arrays allocated once: an integration takes thousands of
 * steps, and fresh arrays for each kept the garbage collector busier than the arithmetic.
 */
export function radauStepper(
  sys: ImplicitSystem,
): (y0: Float64Array, h: number, scale: Float64Array, newtonTol: number) => RadauStep | undefined {
  const n = sys.n;
  const N = 3 * n;
  const z = new Float64Array(N); // Z_j = Y_j − y0, stacked
  const y = [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
  const fy = [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
  const jac = [new Float64Array(n * n), new Float64Array(n * n), new Float64Array(n * n)];
  const big = new Float64Array(N * N);
  const rhs = new Float64Array(N);
  const rowScale = new Float64Array(N);
  return step;
  function step(y0: Float64Array, h: number, scale: Float64Array, newtonTol: number): RadauStep | undefined {
    z.fill(0);
    let previous = Infinity;
    let lu: ReturnType<typeof luFactor> | undefined;
    const stageValues = () => {
      for (let j = 0; j < 3; j++) for (let i = 0; i < n; i++) y[j]![i] = y0[i]! + z[j * n + i]!;
    };
    stageValues();
    // Simplified Newton with the Jacobian at y0; full Newton when that converges slowly (a stage crossing
    // from its linear range into saturation within the step).
    let perStage = false;
    const factor = () => {
      if (perStage) for (let j = 0; j < 3; j++) sys.jacobian(y[j]!, jac[j]!);
      else sys.jacobian(y0, jac[0]!);
      for (let bi = 0; bi < 3; bi++)
        for (let bj = 0; bj < 3; bj++) {
          const a = h * RADAU_A[bi]![bj]!;
          const J = jac[perStage ? bj : 0]!;
          for (let i = 0; i < n; i++)
            for (let k = 0; k < n; k++)
              big[(bi * n + i) * N + bj * n + k] = (bi === bj ? sys.M[i * n + k]! : 0) - a * J[i * n + k]!;
        }
      // Rows mix charge (capacitance) and current (h·conductance) scales: equilibrate them so that partial
      // pivoting compares like with like.
      for (let r = 0; r < N; r++) {
        let m = 0;
        for (let c = 0; c < N; c++) m = Math.max(m, Math.abs(big[r * N + c]!));
        rowScale[r] = m > 0 ? 1 / m : 1;
        for (let c = 0; c < N; c++) big[r * N + c]! *= rowScale[r]!;
      }
      lu = luFactor(big, N);
    };
    factor();
    for (let iter = 0; iter < MAX_NEWTON; iter++) {
      if (lu!.singular) return undefined;
      for (let j = 0; j < 3; j++) sys.f(y[j]!, fy[j]!);
      // Residual of M·Z_i − h·Σ_j a_ij·f(Y_j) = 0, negated.
      for (let bi = 0; bi < 3; bi++)
        for (let i = 0; i < n; i++) {
          let s = 0;
          for (let k = 0; k < n; k++) s += sys.M[i * n + k]! * z[bi * n + k]!;
          for (let bj = 0; bj < 3; bj++) s -= h * RADAU_A[bi]![bj]! * fy[bj]![i]!;
          rhs[bi * n + i] = -s * rowScale[bi * n + i]!;
        }
      const dz = luSolve(lu!, rhs);
      let norm = 0;
      // An update at the roundoff of the stage values cannot shrink further, whatever the tolerance asks.
      let roundoff = true;
      for (let r = 0; r < N; r++) {
        if (!Number.isFinite(dz[r]!)) return undefined;
        z[r]! += dz[r]!;
        const w = dz[r]! / scale[r % n]!;
        norm += w * w;
        if (Math.abs(dz[r]!) > ROUNDOFF * Math.abs(y0[r % n]! + z[r]!)) roundoff = false;
      }
      norm = Math.sqrt(norm / N);
      stageValues();
      if (norm <= newtonTol || roundoff)
        return { y: Float64Array.from(y[2]!), stages: y.map((v) => Float64Array.from(v)) };
      const rate = norm / previous;
      if (rate >= 1 && iter > 1) return undefined;
      // Slow convergence: switch to full Newton, the Jacobian at the current stages every iteration.
      if (rate > 0.1 || perStage) {
        perStage = true;
        factor();
      }
      previous = norm;
    }
    return undefined;
  }
}

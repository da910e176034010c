// Each root is checked against the network itself: the nodal matrix at a pole (or the system matrix at a
// zero) must be singular. The matrices are scaled by the magnitudes of the elements that built each entry,
// so that "singular" is judged relative to the elements, not to entries that are already differences.
// The same factorisation gives the null vectors from which node participation is read, and Newton steps
// on the determinant polish any root that a rotated realisation left less accurate.
import type { Network } from '../circuit/network';
import type { Complex, Participation } from './types';
import {
  complexLuFactor,
  complexLuSolve,
  complexNullVectors,
  lastPivotInPlace,
  type ComplexLu,
} from '../numeric/complexLu';
import { luFactor, luSolve } from '../numeric/luReal';
import { showParticipation } from './participation';

interface Pencil {
  readonly m: number;
  readonly re: Float64Array;
  readonly im: Float64Array;
  /** Row and column scalings applied to reach `re`, `im` from the unscaled matrix. */
  readonly rows: Float64Array;
  readonly cols: Float64Array;
}

/** Row then column scaling from a matrix of element magnitudes, applied to (re, im). */
function scale(re: Float64Array, im: Float64Array, mag: Float64Array, m: number): Pencil {
  const rows = new Float64Array(m).fill(1);
  const cols = new Float64Array(m).fill(1);
  for (let i = 0; i < m; i++) {
    let best = 0;
    for (let j = 0; j < m; j++) best = Math.max(best, mag[i * m + j]);
    if (best > 0) rows[i] = 1 / best;
  }
  for (let j = 0; j < m; j++) {
    let best = 0;
    for (let i = 0; i < m; i++) best = Math.max(best, mag[i * m + j] * rows[i]);
    if (best > 0) cols[j] = 1 / best;
  }
  for (let i = 0; i < m; i++) {
    for (let j = 0; j < m; j++) {
      const f = rows[i] * cols[j];
      re[i * m + j] *= f;
      im[i * m + j] *= f;
    }
  }
  return { m, re, im, rows, cols };
}

/** G + sC, scaled. */
function polePencil(net: Network, s: Complex): Pencil {
  const { n, G, C } = net;
  const gAbs = net.gAbs ?? G;
  const w = Math.sqrt(s.re * s.re + s.im * s.im);
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  const mag = new Float64Array(n * n);
  for (let i = 0; i < n * n; i++) {
    re[i] = G[i] + s.re * C[i];
    im[i] = s.im * C[i];
    mag[i] = Math.abs(gAbs[i]) + w * Math.abs(C[i]);
  }
  return scale(re, im, mag, n);
}

/** The system matrix [[G + sC, gIn + s·cIn], [e_outᵀ, 0]], scaled. */
function zeroPencil(net: Network, s: Complex): Pencil {
  const { n, G, C, gIn, cIn, output } = net;
  const gAbs = net.gAbs ?? G;
  const gInAbs = net.gInAbs ?? gIn;
  const w = Math.sqrt(s.re * s.re + s.im * s.im);
  const m = n + 1;
  const re = new Float64Array(m * m);
  const im = new Float64Array(m * m);
  const mag = new Float64Array(m * m);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      re[i * m + j] = G[i * n + j] + s.re * C[i * n + j];
      im[i * m + j] = s.im * C[i * n + j];
      mag[i * m + j] = Math.abs(gAbs[i * n + j]) + w * Math.abs(C[i * n + j]);
    }
    re[i * m + n] = gIn[i] + s.re * cIn[i];
    im[i * m + n] = s.im * cIn[i];
    mag[i * m + n] = Math.abs(gInAbs[i]) + w * Math.abs(cIn[i]);
  }
  re[n * m + output] = 1;
  mag[n * m + output] = 1;
  return scale(re, im, mag, m);
}

/** |last pivot| of the scaled matrix (entries of magnitude ≤ 1): near zero at a true root. */
const lastPivot = (f: ComplexLu) => {
  const k = f.n - 1;
  return k < 0 ? 1 : Math.sqrt(f.re[k * f.n + k] ** 2 + f.im[k * f.n + k] ** 2);
};

export interface PoleCheck {
  readonly residual: number;
  /** As shown to users: internal nodes labelled, a junction counted with its node (see participation.ts). */
  readonly participation: Participation[];
  /** Per network node under its network name; only when the network has internal nodes. */
  readonly rawParticipation?: Participation[];
  readonly namedAfter: string;
}

export function checkPole(net: Network, s: Complex): PoleCheck {
  const { n, C } = net;
  const p = polePencil(net, s);
  const f = complexLuFactor(p.re, p.im, n);
  const v = complexNullVectors(f);
  // Unscaled vectors: φ = Dc·φ', ψ = Dr·ψ'. p_i = ψ_i·(Cφ)_i; shares are |p_i|/Σ|p_j|, so the
  // normalisation ψᵀCφ = 1 cancels and need not be applied.
  const phiRe = new Float64Array(n);
  const phiIm = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    phiRe[j] = v.rightRe[j] * p.cols[j];
    phiIm[j] = v.rightIm[j] * p.cols[j];
  }
  const shares = new Float64Array(n);
  const psiRe = new Float64Array(n);
  const psiIm = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let cr = 0;
    let ci = 0;
    for (let j = 0; j < n; j++) {
      const cij = C[i * n + j];
      if (cij === 0) continue;
      cr += cij * phiRe[j];
      ci += cij * phiIm[j];
    }
    const pr = (psiRe[i] = v.leftRe[i] * p.rows[i]);
    const pi = (psiIm[i] = v.leftIm[i] * p.rows[i]);
    shares[i] = Math.hypot(pr * cr - pi * ci, pr * ci + pi * cr); // scale unknown: keep hypot
  }
  const shown = showParticipation(net, shares, phiRe, phiIm, psiRe, psiIm);
  return {
    residual: lastPivot(f),
    participation: shown.participation,
    ...(shown.raw ? { rawParticipation: shown.raw } : {}),
    namedAfter: shown.namedAfter,
  };
}

/**
 * Scratch matrices for the residual checks, one set per size. Every check overwrites them entirely and
 * nothing keeps a reference, so reuse is safe (the engine is synchronous).
 */
interface Scratch {
  readonly re: Float64Array;
  readonly im: Float64Array;
  readonly mag: Float64Array;
  readonly rows: Float64Array;
}
const scratchBySize = new Map<number, Scratch>();
function scratch(m: number): Scratch {
  let w = scratchBySize.get(m);
  if (!w) {
    const k = m * m;
    w = {
      re: new Float64Array(k),
      im: new Float64Array(k),
      mag: new Float64Array(k),
      rows: new Float64Array(m),
    };
    scratchBySize.set(m, w);
  }
  return w;
}

/**
 * The check of one root without allocation: the pencil (`zero`: the system matrix) is written into
 * scratch, scaled exactly as `scale` does, and eliminated in place for its last pivot. Same numbers as
 * lastPivot(complexLuFactor(pencil)).
 */
function residualAt(net: Network, s: Complex, zero: boolean): number {
  const { n, G, C } = net;
  const gAbs = net.gAbs ?? G;
  const m = zero ? n + 1 : n;
  const { re, im, mag, rows } = scratch(m);
  const w = Math.sqrt(s.re * s.re + s.im * s.im);
  const sr = s.re;
  const si = s.im;
  const real = si === 0;
  for (let i = 0; i < n; i++) {
    const src = i * n;
    const dst = i * m;
    for (let j = 0; j < n; j++) {
      const c = C[src + j];
      re[dst + j] = G[src + j] + sr * c;
      mag[dst + j] = Math.abs(gAbs[src + j]) + w * Math.abs(c);
      if (!real) im[dst + j] = si * c;
    }
  }
  if (zero) {
    const { gIn, cIn, output } = net;
    const gInAbs = net.gInAbs ?? gIn;
    for (let i = 0; i < n; i++) {
      const c = cIn[i];
      re[i * m + n] = gIn[i] + sr * c;
      mag[i * m + n] = Math.abs(gInAbs[i]) + w * Math.abs(c);
      if (!real) im[i * m + n] = si * c;
    }
    const last = n * m;
    for (let j = 0; j < m; j++) {
      re[last + j] = 0;
      mag[last + j] = 0;
      if (!real) im[last + j] = 0;
    }
    re[last + output] = 1;
    mag[last + output] = 1;
  }
  // Row then column scaling from the element magnitudes (as in `scale`).
  for (let i = 0; i < m; i++) {
    let best = 0;
    for (let j = 0; j < m; j++) best = Math.max(best, mag[i * m + j]);
    rows[i] = best > 0 ? 1 / best : 1;
  }
  for (let j = 0; j < m; j++) {
    let best = 0;
    for (let i = 0; i < m; i++) best = Math.max(best, mag[i * m + j] * rows[i]);
    const col = best > 0 ? 1 / best : 1;
    for (let i = 0; i < m; i++) {
      const f = rows[i] * col;
      re[i * m + j] *= f;
      if (!real) im[i * m + j] *= f;
    }
  }
  let allReal = real;
  if (!real) {
    allReal = true;
    for (let i = 0; i < m * m; i++) {
      if (im[i] !== 0) {
        allReal = false;
        break;
      }
    }
  }
  return lastPivotInPlace(re, im, m, allReal);
}

export function poleResidual(net: Network, s: Complex): number {
  return residualAt(net, s, false);
}

export function zeroResidual(net: Network, s: Complex): number {
  return residualAt(net, s, true);
}

/** The unscaled derivative of the pencil in s: C for poles, [[C, cIn], [0, 0]] for zeros. */
function poleDerivative(net: Network): Float64Array {
  return net.C;
}

function zeroDerivative(net: Network): Float64Array {
  const { n, C, cIn } = net;
  const m = n + 1;
  const d = new Float64Array(m * m);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) d[i * m + j] = C[i * n + j];
    d[i * m + n] = cIn[i];
  }
  return d;
}

/**
 * Newton's method on det M(s): s ← s − 1/tr(M⁻¹·M'). On the scaled pencil Dr·M·Dc the trace term is
 * tr((DrMDc)⁻¹·Dr·M'·Dc), the same number. Keeps a step only when the network check improves.
 */
function polish(
  s0: Complex,
  pencilAt: (s: Complex) => Pencil,
  residualOf: (s: Complex) => number,
  D: Float64Array,
  residual0: number,
): Complex {
  let s = s0;
  let best = residual0;
  for (let iter = 0; iter < 4 && best > 1e-15; iter++) {
    const p = pencilAt(s);
    const f = complexLuFactor(p.re, p.im, p.m);
    const m = p.m;
    let tr = 0;
    let ti = 0;
    const col = new Float64Array(m);
    const zero = new Float64Array(m);
    for (let j = 0; j < m; j++) {
      let any = false;
      for (let i = 0; i < m; i++) {
        col[i] = p.rows[i] * D[i * m + j] * p.cols[j];
        any ||= col[i] !== 0;
      }
      if (!any) continue;
      const [xr, xi] = complexLuSolve(f, col, zero);
      if (!Number.isFinite(xr[j]) || !Number.isFinite(xi[j])) return s;
      tr += xr[j];
      ti += xi[j];
    }
    const den = tr * tr + ti * ti;
    if (!(den > 0) || !Number.isFinite(den)) break;
    const next = { re: s.re - tr / den, im: s0.im === 0 ? 0 : s.im + ti / den };
    const r = residualOf(next);
    if (!(r < best)) break;
    best = r;
    s = next;
  }
  return s;
}

/** Roots whose check is above this are polished. */
const POLISH_ABOVE = 1e-13;
const ORIGIN: Complex = { re: 0, im: 0 };

/**
 * The network check of each root computed while refining, keyed by the root object, so that reporting
 * `residual` later costs nothing. A root put at the origin afterwards is a new object without an entry.
 * One plain Map per analysis (it lives and dies with the result; a WeakMap would make every collection
 * trace ephemerons).
 */
export type ResidualMap = Map<Complex, number>;

function refineAll(
  roots: Complex[],
  pencilAt: (s: Complex) => Pencil,
  residual: (s: Complex) => number,
  D: () => Float64Array,
  doPolish: boolean,
  knownResidual: ResidualMap,
): Complex[] {
  if (!doPolish || roots.length === 0) return roots;
  const out: Complex[] = [];
  for (let i = 0; i < roots.length; i++) {
    const s = roots[i];
    const prev = roots[i - 1];
    if (s.im < 0 && prev && prev.im === -s.im && prev.re === s.re) {
      // Keep conjugate pairs exactly conjugate.
      const partner = out[i - 1];
      const conj = { re: partner.re, im: -partner.im };
      const r = knownResidual.get(partner);
      if (r !== undefined) knownResidual.set(conj, r);
      out.push(conj);
      continue;
    }
    const r = residual(s);
    if (r > POLISH_ABOVE) {
      const t = polish(s, pencilAt, residual, D(), r);
      knownResidual.set(t, t === s ? r : residual(t));
      out.push(t);
    } else {
      knownResidual.set(s, r);
      out.push(s);
    }
  }
  return out;
}

/**
 * Put the `count` smallest roots at the origin when they lie within `window` of it. A multiple root at the
 * origin comes back split by about ε^(1/k) times the scale of the network; `count` comes from the network
 * (see originZeroCount), so a small genuine root is never moved.
 */
function snapToOrigin(roots: Complex[], count: number, window: number): Complex[] {
  if (count <= 0) return roots;
  const order = roots
    .map((r, i) => ({ i, m: Math.sqrt(r.re * r.re + r.im * r.im) }))
    .sort((a, b) => a.m - b.m)
    .slice(0, count);
  const out = [...roots];
  for (const { i, m } of order) if (m <= window) out[i] = { re: 0, im: 0 };
  return out;
}

/**
 * How many zeros the transfer has at s = 0: the order of the first non-vanishing moment of H(s) about
 * s = 0 (v₀ = −G⁻¹gIn, v_k = −G⁻¹(C·v_(k−1) + cIn·[k = 1]), m_k = v_k[out]). Undefined when G is singular.
 */
export function originZeroCount(net: Network): number | undefined {
  const { n, G, C, gIn, cIn, output } = net;
  if (conductanceSingular(net)) return undefined;
  const f = luFactor(G, n);
  let v = luSolve(
    f,
    gIn.map((x) => -x),
  );
  for (let k = 0; k <= n; k++) {
    let size = 0;
    for (let i = 0; i < n; i++) size = Math.max(size, Math.abs(v[i]));
    if (size > 0 && Math.abs(v[output]) > 1e-9 * size) return k;
    const rhs = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      let acc = k === 0 ? cIn[i] : 0;
      for (let j = 0; j < n; j++) acc += C[i * n + j] * v[j];
      rhs[i] = -acc;
    }
    v = luSolve(f, rhs);
  }
  return n + 1;
}

/**
 * G is singular relative to the elements that built it (a node with no DC path), judged on G scaled by
 * the stamp magnitudes: a conductance and a transconductance that nearly cancel leave a small but
 * well-defined entry, not a singular matrix.
 */
export function conductanceSingular(net: Network): boolean {
  return poleResidual(net, ORIGIN) < 1e-14;
}

/** Largest root magnitude: the scale below which a root may sit at the origin. */
export const rootScale = (roots: readonly Complex[]) =>
  roots.reduce((m, r) => Math.max(m, Math.sqrt(r.re * r.re + r.im * r.im)), 0);

/** Polish (unless `doPolish` is false) and put roots that belong at the origin there. */
export function refinePoles(
  net: Network,
  poles: Complex[],
  scaleMag = rootScale(poles),
  doPolish = true,
  residuals: ResidualMap = new Map(),
): Complex[] {
  const out = refineAll(
    poles,
    (s) => polePencil(net, s),
    (s) => residualAt(net, s, false),
    () => poleDerivative(net),
    doPolish,
    residuals,
  );
  // Poles at the origin only with a singular G (a node with charge but no DC path).
  if (!out.some((p) => Math.sqrt(p.re * p.re + p.im * p.im) < 1e-8 * scaleMag) || !conductanceSingular(net))
    return out;
  const count = out.filter((p) => poleResidual(net, p) >= poleResidual(net, ORIGIN)).length;
  return snapToOrigin(out, Math.max(1, count), 1e-8 * scaleMag);
}

export function refineZeros(
  net: Network,
  zeros: Complex[],
  scaleMag: number,
  doPolish = true,
  residuals: ResidualMap = new Map(),
): Complex[] {
  let D: Float64Array | undefined;
  const out = refineAll(
    zeros,
    (s) => zeroPencil(net, s),
    (s) => residualAt(net, s, true),
    () => (D ??= zeroDerivative(net)),
    doPolish,
    residuals,
  );
  const window = 1e-3 * scaleMag;
  if (!out.some((z) => Math.sqrt(z.re * z.re + z.im * z.im) <= window)) return out;
  return snapToOrigin(out, originZeroCount(net) ?? 0, window);
}

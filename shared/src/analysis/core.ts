// The exact analysis of one network: poles, zeros, gains and loop metrics, shared by analyzeDesign, the
// sweeps and the synthesis routines (which skip the costlier parts they do not need).
import type { Network } from '../circuit/network';
import type { Complex, LoopMetrics } from './types';
import { realize, nodalDcGain, type StateSpace } from './realization';
import { poleZeroGain } from './polesZeros';
import { lowFrequencySign, type PoleZeroForm } from './frequency';
import { crossingsOf, frequencySpan, loopMetrics, sampleLogGrid } from './loop';
import { eigenvalues } from '../numeric/eigenvalues';
import type { AnalysisProblem } from './types';
import { cancelAtOrigin, dcFromRoots, heldCharges, snapHeld } from './heldCharge';
import { refinePoles, refineZeros, rootScale, type ResidualMap } from './rootCheck';

export interface CoreResult {
  readonly network: Network;
  readonly system: StateSpace;
  /** Open loop A(s), roots sorted by magnitude. */
  readonly open: PoleZeroForm & { readonly relativeDegree: number };
  readonly dcGain: number;
  readonly sign: number;
  readonly beta: number;
  readonly closed: StateSpace;
  readonly closedPoles: Complex[];
  readonly loop: LoopMetrics;
  readonly openLoopUgfHz?: number;
  readonly grid: number[];
  readonly tiny: number;
  /** The network check of each root, computed while refining (absent for roots not checked). */
  readonly residuals: ResidualMap;
  /** Nodes that keep their charge: that many closed-loop poles are exactly 0 and are not a drift. */
  readonly heldCharges: number;
}

export type CoreOutcome = { ok: true; result: CoreResult } | { ok: false; problems: AnalysisProblem[] };

export const byMagnitude = (a: Complex, b: Complex) => {
  // Squared magnitudes: the order is the same and Math.hypot is slow in a sort comparator.
  const d = a.re * a.re + a.im * a.im - (b.re * b.re + b.im * b.im);
  return d !== 0 ? d : b.im - a.im;
};

/** Closed loop of σ·A with feedback β: u = r − β·y. */
export function closeLoop(sys: StateSpace, beta: number, sign: number): StateSpace {
  const n = sys.order;
  const den = 1 + beta * sign * sys.d;
  const A = Float64Array.from(sys.A);
  const f = (beta * sign) / den;
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) A[i * n + j] -= f * sys.b[i] * sys.c[j];
  const b = sys.b.map((x) => x / den);
  const c = sys.c.map((x) => (sign * x) / den);
  return { order: n, A, b, c, d: (sign * sys.d) / den };
}

/**
 * `light`: only what the synthesis and sweeps read (roots, DC gain, crossings, phase margin); the closed
 * loop, gain margin, peaking and the open-loop UGF are left out.
 */
export function analyzeCore(
  network: Network,
  beta: number,
  light = false,
  /** σ as given instead of normalised (a loop broken in the circuit keeps its own sign). */
  fixedSign?: number,
): CoreOutcome {
  const real = realize(network);
  if (!real.ok) return real;
  const system = real.system;
  const pz = poleZeroGain(system);
  const scale = Math.max(rootScale(pz.poles), rootScale(pz.zeros));
  // Newton polishing recovers digits the rotated realisation loses (near-cancellations in G, capacitances
  // many decades apart); the light path (synthesis) skips it, and the full analysis of the result
  // polishes them.
  const polish = !light;
  const residuals: ResidualMap = new Map();
  const refinedPoles = refinePoles(network, pz.poles.sort(byMagnitude), scale, polish, residuals);
  const refinedZeros = refineZeros(network, pz.zeros.sort(byMagnitude), scale, polish, residuals);
  // A node that keeps its charge puts a pole at the origin that no source excites: it cancels against a
  // zero there in A(s), and its closed-loop pole is exactly 0 (heldCharge.ts).
  const held = heldCharges(network);
  const kept =
    held > 0 ? cancelAtOrigin(refinedPoles, refinedZeros) : { poles: refinedPoles, zeros: refinedZeros };
  const poles = kept.poles.sort(byMagnitude);
  const zeros = kept.zeros.sort(byMagnitude);
  const open = { poles, zeros, k: pz.k, relativeDegree: pz.relativeDegree };
  const sign = fixedSign ?? lowFrequencySign(open);
  const atOrigin = (r: Complex) => r.re === 0 && r.im === 0;
  let dcGain = nodalDcGain(network);
  // With held charges G is singular though A(0) is finite: read it from the roots that remain.
  if (dcGain === undefined && held > 0) dcGain = dcFromRoots(pz.k, poles, zeros);
  if (dcGain === undefined) dcGain = sign * Infinity;
  // A transfer that vanishes identically, or has a zero at the origin with no pole there, is 0 at DC
  // exactly; the nodal solve would return roundoff.
  const zerosAt0 = zeros.filter(atOrigin).length;
  const polesAt0 = poles.filter(atOrigin).length;
  if (open.k === 0 || zerosAt0 > polesAt0) dcGain = 0;
  const closed = closeLoop(system, beta, sign);
  let closedPoles: Complex[] = [];
  if (!light) {
    const ce = eigenvalues(closed.A, closed.order);
    closedPoles = snapHeld(
      Array.from(ce.re, (re, i) => ({ re, im: ce.im[i] })),
      held,
    ).sort(byMagnitude);
  }
  const span = frequencySpan(open, Math.max(1, Math.abs(beta)), [Math.abs(dcGain), Math.abs(beta * dcGain)]);
  const { grid, samples } = sampleLogGrid(open, span.lo, span.hi);
  const loop = loopMetrics({
    open,
    samples,
    closedPoles,
    dcGain,
    beta,
    sign,
    grid,
    tiny: span.tiny,
    d: system.d,
    light,
  });
  let openLoopUgfHz: number | undefined;
  if (!light) {
    // With β² = 1 the loop and open-loop crossings are the same search on the same samples: reuse it.
    if (beta * beta === 1) openLoopUgfHz = loop.ugfHz;
    else for (const c of crossingsOf(samples)) if (c.down) openLoopUgfHz = c.omega / (2 * Math.PI);
  }
  return {
    ok: true,
    result: {
      network,
      system,
      open,
      dcGain,
      sign,
      beta,
      closed,
      closedPoles,
      loop,
      openLoopUgfHz,
      grid,
      tiny: span.tiny,
      residuals,
      heldCharges: held,
    },
  };
}

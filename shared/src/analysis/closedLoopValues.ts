// The closed loop's numbers that requirements judge, read from one analysis: the output impedance and the
// supply rejection at a frequency, the load-step deviation, the closed-loop DC gain. Pure reads of
// DesignAnalysis; undefined where the analysis does not hold the response (a loop given as a factor has no
// circuit to take an output impedance of).
import type { DesignAnalysis, Transfer } from './types';
import { evaluatePzk } from './polesZeros';

/** |H(j·2π·hz)| of a pole/zero/gain transfer. */
export function magnitudeAt(t: Transfer, hz: number): number {
  if (hz === 0) return Math.abs(t.dc);
  const [re, im] = evaluatePzk(t, 0, 2 * Math.PI * hz);
  return Math.hypot(re, im);
}

/** |Zout| at `hz` (Ω), or its peak over the plotted band without a frequency. */
export function outputImpedance(a: DesignAnalysis, hz?: number): number | undefined {
  const z = a.closedCircuit?.outputImpedance;
  if (!z) return undefined;
  return hz === undefined ? z.peakOhm : magnitudeAt(z, hz);
}

/**
 * The lowest supply rejection at `hz` (dB, −20·log10|v(out)/v(supply)|) over the named supply or, without
 * one, over every supply, with the supply that sets it.
 */
export function supplyRejection(
  a: DesignAnalysis,
  hz: number,
  node?: string,
): { readonly db: number; readonly node: string } | undefined {
  let worst: { db: number; node: string } | undefined;
  for (const s of a.closedCircuit?.supplies ?? []) {
    if (node !== undefined && s.node !== node) continue;
    const db = -20 * Math.log10(magnitudeAt(s.transfer, hz));
    if (!worst || db < worst.db) worst = { db, node: s.node };
  }
  return worst;
}

/** The output's largest deviation (V) for a load-current step of `step` amperes. */
export function loadStepDeviation(a: DesignAnalysis, step: number): number | undefined {
  const ls = a.closedCircuit?.loadStep;
  return ls ? ls.peakDeviation * Math.abs(step) : undefined;
}

/**
 * The closed loop's DC gain from the input to the output (V/V): the circuit's own for `feedback at`;
 * for a loop given by a factor, σA(0)/(1 + βσA(0)) = |A(0)|/(1 + L(0)), since the loop gain L(0) = β·|A(0)|.
 */
export function closedLoopDcGain(a: DesignAnalysis): number | undefined {
  if (a.closedCircuit) return a.closedCircuit.gain.dc;
  const a0 = Math.abs(a.dcGain);
  if (!(a0 > 0) || a.problems.length > 0) return undefined;
  if (Number.isFinite(a0)) return a0 / (1 + a.loop.dcGain);
  return a.step?.final;
}

// The closed loop's numbers that requirements judge, read from one analysis: the output impedance and the
// supply rejection at a frequency, the load-step deviation, the closed-loop DC gain. Pure reads of
// DesignAnalysis; undefined where the analysis does not hold the response (a loop given as a factor has no
// circuit to take an output impedance of).
import type { DesignAnalysis, Transfer } from './types';
import { evaluatePzk } from './polesZeros';
import { bandGrid, responseBand } from './closedCircuit';
import { pzBode } from './frequency';

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
 * The closed loop's DC gain from the input to the output (V/V), from the closed-loop transfer when it was
 * computed; else, for a loop given by a factor, σA(0)/(1 + βσA(0)) = |A(0)|/(1 + L(0)), since the loop
 * gain L(0) = β·|A(0)|.
 */
export function closedLoopDcGain(a: DesignAnalysis): number | undefined {
  if (a.closedLoopGain) return a.closedLoopGain.dc;
  const a0 = Math.abs(a.dcGain);
  if (!(a0 > 0) || a.problems.length > 0) return undefined;
  if (Number.isFinite(a0)) return a0 / (1 + a.loop.dcGain);
  return a.step?.final;
}

/** The loop gain's Bode data on the band grid of its roots (documented for `analyze --json`, `bode`). */
export function loopBode(
  a: DesignAnalysis,
): { readonly frequencyHz: number[]; readonly magDb: number[]; readonly phaseDeg: number[] } | undefined {
  const l = a.loopGain;
  if (!l || a.problems.length > 0) return undefined;
  const roots = [...l.poles, ...l.zeros];
  const frequencyHz = bandGrid(responseBand(roots, a.loop.ugfHz));
  let max = 0;
  for (const r of roots) max = Math.max(max, Math.hypot(r.re, r.im));
  // Roots below this are at the origin to working precision (as everywhere in the loop analysis).
  const bode = pzBode(l, frequencyHz, 1, max * 1e-14);
  return { frequencyHz, magDb: bode.magDb, phaseDeg: bode.phaseDeg };
}

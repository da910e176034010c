// Frequency responses for charts and for the agreement tests: the direct nodal solve and the
// pole/zero/gain form of the same A(jω) and L(jω) = β·σ·A(jω).
import type { DesignModel } from '../language/model';
import type { Network } from '../circuit/network';
import type { AnalysisProblem } from './types';
import { loopNetwork } from './loopCore';
import { analyzeCore, type CoreResult } from './core';
import { nodalBode, pzBode, unwrappedPhaseDeg, type Bode } from './frequency';

export interface BodeResult extends Bode {
  /** Present (and the arrays empty) when the design could not be analysed. */
  readonly problems?: readonly AnalysisProblem[];
}

function coreOf(
  source: Network | DesignModel,
  beta?: number,
): { ok: true; core: CoreResult } | { ok: false; problems: AnalysisProblem[] } {
  try {
    let net: Network;
    let b = beta ?? 1;
    let sign: number | undefined;
    if ('G' in source) net = source;
    else {
      const built = loopNetwork(source);
      if (!built.ok) return built;
      net = built.loop.network;
      b = beta ?? built.loop.beta;
      sign = built.loop.sign;
    }
    const r = analyzeCore(net, b, false, sign);
    return r.ok ? { ok: true, core: r.result } : r;
  } catch (err) {
    return { ok: false, problems: [{ message: `the analysis failed: ${String(err)}` }] };
  }
}

const failed = (problems: readonly AnalysisProblem[]): BodeResult => ({ magDb: [], phaseDeg: [], problems });

/**
 * The response, or a problem when a sample is NaN: the solve left double precision (a magnitude of −∞ dB
 * is a true zero of the response and stays).
 */
function computed(bode: Bode): BodeResult {
  if (bode.magDb.some(Number.isNaN) || bode.phaseDeg.some(Number.isNaN)) {
    return failed([
      {
        message:
          'the frequency response leaves the range of double precision (values in the network lie too far apart)',
      },
    ]);
  }
  return bode;
}

/** A frequency well below every root, where the phase equals its DC value. */
const startOmega = (core: CoreResult) => core.grid[0] / 1e3;

/** The DC phase convention at the start frequency: 0 or 180°, less 90° per excess pole at the origin. */
const dcPhase = (core: CoreResult, gain: number) => {
  const p = unwrappedPhaseDeg({ ...core.open, k: core.open.k * gain }, startOmega(core), core.tiny);
  return 90 * Math.round(p / 90);
};

/** Open-loop A(jω) by direct complex solve of the nodal equations (hz in Hz). */
export function openLoopResponse(source: Network | DesignModel, hz: readonly number[]): BodeResult {
  const r = coreOf(source);
  if (!r.ok) return failed(r.problems);
  return computed(nodalBode(r.core.network, hz, 1, startOmega(r.core), dcPhase(r.core, 1)));
}

/** Loop gain L(jω) = β·σ·A(jω) by direct complex solve; β from the model (or `beta` for a network). */
export function loopResponse(
  source: Network | DesignModel,
  hz: readonly number[],
  beta?: number,
): BodeResult {
  const r = coreOf(source, beta);
  if (!r.ok) return failed(r.problems);
  const gain = r.core.beta * r.core.sign;
  return computed(nodalBode(r.core.network, hz, gain, startOmega(r.core), dcPhase(r.core, gain)));
}

/** A(jω) from the exact poles, zeros and leading gain. */
export function openLoopResponsePz(source: Network | DesignModel, hz: readonly number[]): BodeResult {
  const r = coreOf(source);
  if (!r.ok) return failed(r.problems);
  return computed(pzBode(r.core.open, hz, 1, r.core.tiny));
}

/** L(jω) from the exact poles, zeros and leading gain. */
export function loopResponsePz(
  source: Network | DesignModel,
  hz: readonly number[],
  beta?: number,
): BodeResult {
  const r = coreOf(source, beta);
  if (!r.ok) return failed(r.problems);
  return computed(pzBode(r.core.open, hz, r.core.beta * r.core.sign, r.core.tiny));
}

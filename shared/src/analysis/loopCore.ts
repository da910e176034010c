// The loop of a design as one transfer A(s) with its closure, whichever way the design states it:
// - `feedback beta = β`: A is the amplifier from `in` to the output, and the loop gain is β·σ·A with σ the
//   sign that makes it negative feedback at DC;
// - `feedback at NODE`: A is the circuit broken at NODE (every transconductor input sensing NODE senses a
//   test voltage), from the test voltage to v(NODE), and the loop gain is the return ratio T = −A, never
//   sign-normalised: a positive-feedback slip must show (docs/analysis.md, The loop of a circuit).
import type { DesignModel } from '../language/model';
import type { Network } from '../circuit/network';
import { buildNetwork, type BuildResult } from '../circuit/buildNetwork';
import { analyzeCore, type CoreOutcome } from './core';
import type { AnalysisProblem } from './types';

export interface LoopNetwork {
  readonly network: Network;
  readonly beta: number;
  /** Fixed σ for a loop broken in the circuit; undefined to normalise it. */
  readonly sign?: number;
}

export function loopNetwork(
  model: DesignModel,
): { ok: true; loop: LoopNetwork } | { ok: false; problems: AnalysisProblem[] } {
  const built = buildLoopNetwork(model);
  if (!built.ok) return built;
  return {
    ok: true,
    loop:
      model.feedback.kind === 'node'
        ? { network: built.network, beta: 1, sign: -1 }
        : { network: built.network, beta: model.feedback.beta },
  };
}

/** The network whose input → output transfer is the loop's A(s) (see loopNetwork). */
export function buildLoopNetwork(model: DesignModel): BuildResult {
  return model.feedback.kind === 'node'
    ? buildNetwork(model, { kind: 'break', node: model.feedback.node })
    : buildNetwork(model);
}

/** analyzeCore on the design's loop (see loopNetwork). */
export function analyzeLoop(model: DesignModel, light = false): CoreOutcome {
  const r = loopNetwork(model);
  if (!r.ok) return r;
  return analyzeCore(r.loop.network, r.loop.beta, light, r.loop.sign);
}

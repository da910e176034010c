// analyzeDesign: the whole exact analysis of one design model. Never throws: modelling errors come back as
// `problems`, located by node.
import type { DesignModel } from '../language/model';
import type { AnalysisProblem, DesignAnalysis, FrequencyBand, Pole, Transfer, Zero } from './types';
import type { CoreResult } from './core';
import { analyzeLoop } from './loopCore';
import { analyzeClosedCircuit, bandwidthHz, peakOver, responseBand } from './closedCircuit';
import { factorClosedLoop } from './loop';
import { checkPole, zeroResidual } from './rootCheck';
import { stepResponse } from './stepResponse';
import { largeSignalFields, largeSignalFieldsOfCircuit } from './largeSignalStep';
import { slewEstimate } from './slew';
import { handEstimates } from './handEstimates';
import { judgeStability, withoutHeld } from './stability';

export interface AnalyzeOptions {
  /** Settling band as a fraction of the final value (default: the design's `settle` requirement, else 0.1 %). */
  readonly settleTolerance?: number;
  /** Compute the closed-loop step response (default true). Sweeps and synthesis turn it off. */
  readonly step?: boolean;
  /**
   * Compute participation (default true). Without it the roots are still checked against the network
   * (and polished) and `residual` is reported; only the participation and its null vectors are skipped.
   */
  readonly participation?: boolean;
}

/** A root whose network matrix is not singular to at least this (relative) level is reported as suspect. */
const ROOT_CHECK_LIMIT = 1e-6;
const DEFAULT_TOLERANCE = 0.001;

export function emptyAnalysis(problems: AnalysisProblem[]): DesignAnalysis {
  return { poles: [], zeros: [], dcGain: 0, loop: { dcGain: 0, crossings: [], peakingDb: 0 }, problems };
}

export function analyzeDesign(model: DesignModel, options: AnalyzeOptions = {}): DesignAnalysis {
  try {
    const core = analyzeLoop(model);
    if (!core.ok) return emptyAnalysis(core.problems);
    if (model.feedback.kind === 'node') return assembleCircuit(model, core.result, options);
    return assemble(model, core.result, options);
  } catch (err) {
    return emptyAnalysis([
      { message: `the analysis failed: ${err instanceof Error ? err.message : String(err)}` },
    ]);
  }
}

export function assemble(model: DesignModel, r: CoreResult, options: AnalyzeOptions): DesignAnalysis {
  const withChecks = options.participation !== false;
  const warnings: string[] = [];
  const poles: Pole[] = r.open.poles.map((s) => {
    const magnitude = Math.sqrt(s.re * s.re + s.im * s.im);
    const damping = magnitude === 0 ? 1 : -s.re / magnitude;
    const hz = magnitude / (2 * Math.PI);
    if (!withChecks) {
      const residual = r.residuals.get(s);
      if (residual !== undefined && residual > ROOT_CHECK_LIMIT) {
        warnings.push(`pole at ${fmt(s)} rad/s failed the network check`);
      }
      return {
        s,
        hz,
        damping,
        participation: [],
        namedAfter: 'shared',
        ...(residual !== undefined ? { residual } : {}),
      };
    }
    const check = checkPole(r.network, s);
    if (check.residual > ROOT_CHECK_LIMIT) warnings.push(`pole at ${fmt(s)} rad/s failed the network check`);
    return {
      s,
      hz,
      damping,
      participation: check.participation,
      ...(check.rawParticipation ? { rawParticipation: check.rawParticipation } : {}),
      namedAfter: check.namedAfter,
      residual: check.residual,
    };
  });
  const zeros: Zero[] = r.open.zeros.map((s) => {
    const zero: Zero = { s, hz: Math.sqrt(s.re * s.re + s.im * s.im) / (2 * Math.PI), rhp: s.re > 0 };
    const known = r.residuals.get(s);
    if (!withChecks) {
      if (known === undefined) return zero;
      if (known > ROOT_CHECK_LIMIT) warnings.push(`zero at ${fmt(s)} rad/s failed the network check`);
      return { ...zero, residual: known };
    }
    const residual = known ?? zeroResidual(r.network, s);
    if (residual > ROOT_CHECK_LIMIT) warnings.push(`zero at ${fmt(s)} rad/s failed the network check`);
    return { ...zero, residual };
  });
  const tolerance = options.settleTolerance ?? settleRequirement(model) ?? DEFAULT_TOLERANCE;
  let step;
  let stepUnavailable: string | undefined;
  const closedGain = factorClosedLoop({ ...r, d: r.system.d, closedPoles: r.closedPoles });
  if (options.step !== false) {
    const final = closedGain.dc;
    const active = withoutHeld(r.closedPoles, r.heldCharges);
    const stable = active.every((p) => p.re < 0);
    const outcome = stepResponse(r.closed, active, stable ? final : NaN, tolerance);
    if (outcome.ok) step = outcome.step;
    else stepUnavailable = outcome.reason;
  }
  // A loop closed by the design's own elements is assembled without its step here (see its caller).
  const large =
    options.step !== false
      ? largeSignalFields(
          model,
          r.network,
          { kind: 'factor', beta: r.beta, sign: r.sign },
          r.closedPoles,
          step,
        )
      : {};
  const analysis: DesignAnalysis = {
    poles,
    zeros,
    dcGain: r.dcGain,
    openLoopUgfHz: r.openLoopUgfHz,
    loop: r.loop,
    step,
    ...(stepUnavailable !== undefined ? { stepUnavailable } : {}),
    ...large,
    slew: slewEstimate(model),
    hand: handEstimates(model, r.open.poles, r.open.zeros),
    problems: [],
    closedLoopPoles: r.closedPoles,
    stability: judgeStability(r.closedPoles, r.open.poles, r.heldCharges),
    loopGain: {
      poles: r.open.poles,
      zeros: r.open.zeros,
      k: r.open.k * r.beta * r.sign,
      dc: r.beta * r.sign * r.dcGain,
    },
    ...(warnings.length > 0 ? { warnings } : {}),
    // The light core (synthesis) leaves the closed loop out: then there is no closed-loop transfer either.
    ...(r.closedPoles.length > 0 || r.open.poles.length === 0
      ? closedLoopGainFields(closedGain, r.loop.ugfHz)
      : {}),
  };
  return analysis;
}

/**
 * A loop closed by the design's own elements: `poles`, `zeros` and `loop` are the loop gain T(s) at the
 * break, `dcGain` is T(0) (positive for negative feedback), and the step, the closed-loop poles and the
 * rest of the closed circuit's responses come from the whole circuit.
 */
function assembleCircuit(model: DesignModel, r: CoreResult, options: AnalyzeOptions): DesignAnalysis {
  const loop = assemble(model, r, { ...options, step: false });
  const tolerance = options.settleTolerance ?? settleRequirement(model) ?? DEFAULT_TOLERANCE;
  const closed = analyzeClosedCircuit(model, [...r.open.poles, ...r.open.zeros], r.loop.ugfHz, tolerance, {
    step: options.step !== false,
    participation: options.participation !== false,
  });
  if (!closed.ok) return emptyAnalysis(closed.problems);
  const { hand: _hand, ...rest } = loop;
  return {
    ...rest,
    // The peaking of the circuit's own response from `in`, as for `feedback beta` it is that of σA/(1 + βσA).
    loop: { ...rest.loop, peakingDb: peakingDb(closed.value.gain, closed.value.circuit.band) },
    // T = −A at the break (loopCore.ts): the sign the loop really has at DC.
    dcGain: -r.dcGain,
    openLoopUgfHz: r.loop.ugfHz,
    ...(closed.value.step ? { step: closed.value.step } : {}),
    ...(closed.value.stepUnavailable !== undefined ? { stepUnavailable: closed.value.stepUnavailable } : {}),
    ...(options.step !== false
      ? largeSignalFieldsOfCircuit(model, closed.value.gain.poles, closed.value.step)
      : {}),
    closedCircuit: closed.value.circuit,
    ...closedLoopGainFields(closed.value.gain, r.loop.ugfHz),
  };
}

/** The peak of |H| over its DC value in dB over the band (0 without a peak, or when H(0) is 0 or infinite). */
function peakingDb(gain: Transfer, band: FrequencyBand): number {
  const h0 = Math.abs(gain.dc);
  if (!(h0 > 0) || !Number.isFinite(h0)) return 0;
  const ratio = peakOver(gain, band).magnitude / h0;
  return ratio > 1 ? 20 * Math.log10(ratio) : 0;
}

/** The closed loop's transfer and its −3 dB bandwidth (when the closed loop was computed). */
function closedLoopGainFields(
  gain: Transfer,
  ugfHz: number | undefined,
): Pick<DesignAnalysis, 'closedLoopGain' | 'closedLoopBandwidthHz'> {
  const bw = bandwidthHz(gain, responseBand([...gain.poles, ...gain.zeros], ugfHz));
  return { closedLoopGain: gain, ...(bw !== undefined ? { closedLoopBandwidthHz: bw } : {}) };
}

function settleRequirement(model: DesignModel): number | undefined {
  for (const req of model.requirements) if (req.kind === 'settle') return req.tolerance;
  return undefined;
}

const fmt = (s: { re: number; im: number }) =>
  s.im === 0
    ? s.re.toPrecision(4)
    : `${s.re.toPrecision(4)} ${s.im < 0 ? '−' : '+'} j${Math.abs(s.im).toPrecision(4)}`;

// The responses of a loop closed by the design's own elements (`feedback at NODE`): in → out, the output
// impedance, the load step and each supply's rejection, all from the whole circuit's nodal equations with
// one source at a time (docs/analysis.md, The loop of a circuit). The loop gain itself comes from the break
// (loopCore.ts); these are the closed circuit's.
import { feedbackNode, type DesignModel } from '../language/model';
import type { Network } from '../circuit/network';
import { buildNetwork, type NetworkSource } from '../circuit/buildNetwork';
import { realize, nodalDcGain, type StateSpace } from './realization';
import { polesOf, zerosOf } from './polesZeros';
import { checkPole, refinePoles, refineZeros, rootScale } from './rootCheck';
import { cancelAtOrigin, dcFromRoots, heldCharges, snapHeld } from './heldCharge';
import { withoutHeld } from './stability';
import { byMagnitude } from './core';
import { logGrid, logMagnitudeFunction } from './loop';
import { brentRoot, goldenMax } from '../numeric/roots';
import { stepResponse } from './stepResponse';
import type {
  AnalysisProblem,
  ClosedCircuit,
  Complex,
  FrequencyBand,
  LoadStepResponse,
  Pole,
  StepResponse,
  SupplyRejection,
  Transfer,
} from './types';

/** A load step has settled when it stays within this fraction of its peak deviation from its final value. */
export const LOAD_STEP_TOLERANCE = 0.01;

/** Points per decade of the band's grid (the `bode` grid of `analyze --json`). */
export const BAND_POINTS_PER_DECADE = 10;

export interface ClosedCircuitResult {
  readonly circuit: ClosedCircuit;
  /** in → out of the whole circuit. */
  readonly gain: Transfer;
  readonly bandwidthHz?: number;
  /** in → out step response of the whole circuit (unit input step), or why it could not be computed. */
  readonly step?: StepResponse;
  readonly stepUnavailable?: string;
}

interface Realized {
  readonly network: Network;
  readonly system: StateSpace;
  /** Nodes that keep their charge (heldCharge.ts). */
  readonly held: number;
  /** Every natural frequency of the network, held charges included (exactly 0). */
  readonly all: readonly Complex[];
  readonly transfer: Transfer;
}

/** The transfer from one source of the closed circuit to the output; `poles` are shared by all of them. */
function transferFrom(
  model: DesignModel,
  source: NetworkSource,
  poles: readonly Complex[] | undefined,
  /** Newton polishing of the roots (the full analysis; sweeps and searches skip it, as for the loop). */
  polish: boolean,
): { ok: true; value: Realized } | { ok: false; problems: AnalysisProblem[] } {
  const built = buildNetwork(model, source);
  if (!built.ok) return built;
  const real = realize(built.network);
  if (!real.ok) return real;
  const held = heldCharges(built.network);
  // Every source sees the same G and C, so the same realised A: its eigenvalues are computed once.
  const z = zerosOf(real.system);
  // Newton polishing on the network itself, as for the loop's roots (core.ts): it recovers the digits
  // the rotated realisation loses.
  const raw = poles ? undefined : polesOf(real.system);
  const scale = Math.max(rootScale(poles ?? raw ?? []), rootScale(z.zeros));
  const all =
    poles ??
    snapHeld(refinePoles(built.network, raw!.sort(byMagnitude), scale, polish), held).sort(byMagnitude);
  const refinedZeros = refineZeros(built.network, z.zeros.sort(byMagnitude), scale, polish);
  // A held charge's pole cancels against a zero at the origin in every transfer (heldCharge.ts).
  const kept = held > 0 ? cancelAtOrigin(all, refinedZeros) : { poles: [...all], zeros: refinedZeros };
  const zeros = kept.zeros.sort(byMagnitude);
  let dc = nodalDcGain(built.network);
  if (dc === undefined && held > 0) dc = dcFromRoots(z.k, kept.poles, zeros);
  if (dc === undefined) dc = Math.sign(z.k) * Infinity;
  if (z.k === 0) dc = 0;
  return {
    ok: true,
    value: {
      network: built.network,
      system: real.system,
      held,
      all,
      transfer: { poles: kept.poles, zeros, k: z.k, dc },
    },
  };
}

/**
 * The band where the closed circuit's responses are plotted and searched: its roots and the loop's, with
 * room, but no further up than a thousand times the loop's unity-gain frequency when it has one (a
 * parasitic mode far above the loop, e.g. an ESR with a femtofarad, says nothing about the regulation).
 */
export function responseBand(roots: readonly Complex[], ugfHz?: number): FrequencyBand {
  let min = Infinity;
  let max = 0;
  for (const r of roots) {
    const m = Math.hypot(r.re, r.im);
    if (m > 0 && Number.isFinite(m)) {
      min = Math.min(min, m);
      max = Math.max(max, m);
    }
  }
  if (max === 0) return { loHz: 1, hiHz: 1e9 };
  // A hundredth of the lowest root to a thousand times the highest: every corner with two decades of
  // asymptote below and three above.
  const lo = min / 100 / (2 * Math.PI);
  let hi = (max * 1000) / (2 * Math.PI);
  if (ugfHz !== undefined && ugfHz > 0 && Number.isFinite(ugfHz))
    hi = Math.max(Math.min(hi, ugfHz * 1000), lo * 10);
  // Decade edges, so the grid is the same whatever the roots' exact values.
  return { loHz: 10 ** Math.floor(Math.log10(lo)), hiHz: 10 ** Math.ceil(Math.log10(hi)) };
}

/** The band's grid (Hz): BAND_POINTS_PER_DECADE per decade, both ends included. */
export function bandGrid(band: FrequencyBand): number[] {
  return logGrid(band.loHz, band.hiHz, BAND_POINTS_PER_DECADE);
}

/** The largest |H| over the band and where it is (sampled on the band's grid, refined by golden section). */
export function peakOver(t: Transfer, band: FrequencyBand): { magnitude: number; hz: number } {
  const f = logMagnitudeFunction(t);
  const grid = bandGrid(band);
  const us = grid.map((hz) => Math.log(2 * Math.PI * hz));
  let bi = 0;
  let best = -Infinity;
  for (let i = 0; i < us.length; i++) {
    const v = f(us[i]);
    if (v > best) {
      best = v;
      bi = i;
    }
  }
  let u = us[bi];
  if (bi > 0 && bi < us.length - 1) {
    const g = goldenMax(f, us[bi - 1], us[bi + 1], 1e-10);
    if (g.value > best) {
      best = g.value;
      u = g.x;
    }
  }
  return { magnitude: Math.sqrt(Math.exp(best)), hz: Math.exp(u) / (2 * Math.PI) };
}

/** The lowest frequency where |H| falls 3 dB below |H(0)|, from DC up (undefined when it never does). */
export function bandwidthHz(t: Transfer, band: FrequencyBand): number | undefined {
  if (!(Math.abs(t.dc) > 0) || !Number.isFinite(t.dc)) return undefined;
  const f = logMagnitudeFunction(t);
  // ln|H|² − ln(|H(0)|²/2): negative once the response is 3 dB down.
  const level = Math.log((t.dc * t.dc) / 2);
  const g = (u: number) => f(u) - level;
  const grid = bandGrid(band);
  let prevU = Math.log(2 * Math.PI * grid[0]);
  let prev = g(prevU);
  if (!(prev > 0)) return undefined;
  for (let i = 1; i < grid.length; i++) {
    const u = Math.log(2 * Math.PI * grid[i]);
    const v = g(u);
    if (v <= 0) return Math.exp(brentRoot(g, prevU, u, prev, v, 1e-12)) / (2 * Math.PI);
    prevU = u;
    prev = v;
  }
  return undefined;
}

/**
 * Output deviation per ampere for a one-ampere load step drawn from the output: −Zout(s)/s, from the
 * exact step response of the current-driven network with its output negated.
 */
function loadStepOf(z: Realized, stable: boolean): LoadStepResponse | undefined {
  // An unstable loop has no deviation to speak of: its output runs away whatever the load does.
  if (!stable) return undefined;
  const { system, transfer } = z;
  const negated = { ...system, c: system.c.map((x) => -x), d: -system.d };
  const final = stable ? -transfer.dc : NaN;
  const active = withoutHeld(z.all, z.held);
  // The band is a fraction of the largest deviation: the final value −Zout(0) of a good regulator is
  // nearly 0, and a band on it would never be entered.
  const outcome = stepResponse(negated, active, final, LOAD_STEP_TOLERANCE, 'excursion');
  if (!outcome.ok) return undefined;
  const { t, y } = outcome.step;
  // The largest deviation: the refined extreme, every sample, and (for a stable loop) the final value,
  // which a monotone response approaches without reaching.
  let peak = Math.abs(outcome.step.peak ?? 0);
  for (const v of y) peak = Math.max(peak, Math.abs(v));
  if (stable) peak = Math.max(peak, Math.abs(outcome.step.final));
  const settlingTime = stable ? outcome.step.settlingTime : undefined;
  return {
    t,
    y,
    final: outcome.step.final,
    peakDeviation: peak,
    ...(settlingTime !== undefined ? { settlingTime } : {}),
    tolerance: LOAD_STEP_TOLERANCE,
  };
}

/** −20·log10|H| (positive when the output moves less than the supply). */
const rejectionDb = (magnitude: number) => -20 * Math.log10(magnitude);

export function analyzeClosedCircuit(
  model: DesignModel,
  loopRoots: readonly Complex[],
  loopUgfHz: number | undefined,
  tolerance: number,
  /**
   * Time responses (the in → out step and the load step), and the poles' participation with the roots
   * polished on the network (what sweeps and searches leave out).
   */
  options: { readonly step: boolean; readonly participation: boolean },
): { ok: true; value: ClosedCircuitResult } | { ok: false; problems: AnalysisProblem[] } {
  const at = feedbackNode(model);
  if (!at) return { ok: false, problems: [{ message: 'the design has no `feedback at` node' }] };
  const gain = transferFrom(model, { kind: 'input' }, undefined, options.participation);
  if (!gain.ok) return gain;
  const poles = gain.value.all;
  const active = withoutHeld(poles, gain.value.held);
  const stable = active.every((p) => p.re < 0);
  const zout = transferFrom(model, { kind: 'current', node: model.output }, poles, options.participation);
  if (!zout.ok) return zout;
  const band = responseBand(
    [...loopRoots, ...poles, ...gain.value.transfer.zeros, ...zout.value.transfer.zeros],
    loopUgfHz,
  );
  const supplies: SupplyRejection[] = [];
  for (const s of model.supplies ?? []) {
    const r = transferFrom(model, { kind: 'supply', node: s.node }, poles, options.participation);
    if (!r.ok) return r;
    const worst = peakOver(r.value.transfer, band);
    supplies.push({
      node: s.node,
      transfer: r.value.transfer,
      dcDb: rejectionDb(Math.abs(r.value.transfer.dc)),
      worstDb: rejectionDb(worst.magnitude),
      worstHz: worst.hz,
    });
  }
  const zPeak = peakOver(zout.value.transfer, band);
  const loadStep = options.step ? loadStepOf(zout.value, stable) : undefined;
  let step: StepResponse | undefined;
  let stepUnavailable: string | undefined;
  if (options.step) {
    const outcome = stepResponse(gain.value.system, active, stable ? gain.value.transfer.dc : NaN, tolerance);
    if (outcome.ok) step = outcome.step;
    else stepUnavailable = outcome.reason;
  }
  const bw = bandwidthHz(gain.value.transfer, band);
  const net = gain.value.network;
  const circuitPoles: Pole[] = poles.map((s) => {
    const magnitude = Math.hypot(s.re, s.im);
    const check = options.participation
      ? checkPole(net, s)
      : { participation: [], namedAfter: 'shared', residual: undefined };
    return {
      s,
      hz: magnitude / (2 * Math.PI),
      damping: magnitude === 0 ? 1 : -s.re / magnitude,
      participation: check.participation,
      namedAfter: check.namedAfter,
      ...(check.residual !== undefined ? { residual: check.residual } : {}),
    };
  });
  const circuit: ClosedCircuit = {
    feedbackNode: at.node,
    poles: circuitPoles,
    outputImpedance: {
      ...zout.value.transfer,
      dcOhm: zout.value.transfer.dc,
      peakOhm: zPeak.magnitude,
      peakHz: zPeak.hz,
    },
    ...(loadStep ? { loadStep } : {}),
    supplies,
    band,
  };
  return {
    ok: true,
    value: {
      circuit,
      gain: gain.value.transfer,
      ...(bw !== undefined ? { bandwidthHz: bw } : {}),
      ...(step ? { step } : {}),
      ...(stepUnavailable !== undefined ? { stepUnavailable } : {}),
    },
  };
}

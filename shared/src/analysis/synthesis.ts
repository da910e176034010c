// Solving one component value on the exact model: bracket on a logarithmic grid of the value, then Brent's
// method on the exact analysis; say why when no value reaches the target.
import type { DesignModel } from '../language/model';
import type { Complex, SynthesisResult } from './types';
import { buildNetwork } from '../circuit/buildNetwork';
import { analyzeCore, type CoreResult } from './core';
import { realize } from './realization';
import { zerosOf } from './polesZeros';
import { withStageGm, withValue, type CompensationTarget } from './variants';
import { brentRoot } from '../numeric/roots';

const mag = (s: Complex) => Math.hypot(s.re, s.im);
const fmt = (x: number, unit: string) => `${x.toPrecision(3)} ${unit}`;

function core(model: DesignModel): CoreResult | undefined {
  try {
    const built = buildNetwork(model);
    if (!built.ok) return undefined;
    const r = analyzeCore(built.network, model.beta, true);
    return r.ok ? r.result : undefined;
  } catch {
    return undefined;
  }
}

const logGrid = (lo: number, hi: number, perDecade: number) => {
  const n = Math.ceil(Math.log10(hi / lo) * perDecade) + 1;
  return Array.from({ length: n }, (_, i) => lo * (hi / lo) ** (i / (n - 1)));
};

/**
 * The smallest grid value where f turns from < 0 to ≥ 0, refined by Brent in log(value). f returns NaN
 * where it is undefined. Also returns the samples, for explaining a failure.
 */
function smallestCrossing(f: (v: number) => number, grid: readonly number[]) {
  const fs = grid.map(f);
  for (let i = 0; i + 1 < grid.length; i++) {
    const a = fs[i];
    const b = fs[i + 1];
    if (a < 0 && b >= 0) {
      const g = (u: number) => {
        const y = f(Math.exp(u));
        return Number.isNaN(y) ? -1 : y;
      };
      const u = brentRoot(g, Math.log(grid[i]), Math.log(grid[i + 1]), a, b, 1e-10);
      return { value: Math.exp(u), samples: fs };
    }
  }
  return { value: undefined, samples: fs };
}

/**
 * The first grid interval whose end samples satisfy `brackets`, refined by Brent in log(value); undefined
 * when no interval does.
 */
function firstBracketedRoot(
  f: (v: number) => number,
  grid: readonly number[],
  brackets: (a: number, b: number) => boolean,
): number | undefined {
  const fs = grid.map(f);
  for (let i = 0; i + 1 < grid.length; i++) {
    if (brackets(fs[i], fs[i + 1])) {
      const g = (x: number) => f(Math.exp(x));
      return Math.exp(brentRoot(g, Math.log(grid[i]), Math.log(grid[i + 1]), fs[i], fs[i + 1], 1e-12));
    }
  }
  return undefined;
}

/** Round to 3 significant figures in the direction that keeps `meets` true; re-checked on the model. */
function rounded(value: number, meets: (v: number) => number | undefined, up: boolean) {
  const p = 10 ** (Math.floor(Math.log10(value)) - 2);
  const first = (up ? Math.ceil(value / p) : Math.floor(value / p)) * p;
  for (const raw of [first, up ? first + p : first - p]) {
    const v = Number(raw.toPrecision(3));
    const achieved = meets(v);
    if (achieved !== undefined) return { rounded: v, roundedAchieved: achieved };
  }
  return {};
}

function millerExists(model: DesignModel, index: number): string | undefined {
  return model.millers[index] ? undefined : `the design has no Miller capacitor number ${index + 1}`;
}

/** The stage that drives node `name`. */
const stageAt = (model: DesignModel, name: string) => model.stages.find((s) => s.name === name);

function gainNote(model: DesignModel, millerIndex: number): string {
  const m = model.millers[millerIndex];
  const st = stageAt(model, m.to) ?? stageAt(model, m.from);
  if (!st) return '';
  const gain = st.gm * st.rout;
  return gain < 10
    ? `; the stage at '${st.name}' has a gain of only ${gain.toPrecision(3)} V/V, too little for Miller compensation to split the poles`
    : '';
}

export function solveCcForPhaseMargin(
  model: DesignModel,
  millerIndex: number,
  targetDeg: number,
): SynthesisResult {
  const missing = millerExists(model, millerIndex);
  if (missing) return { ok: false, reason: missing };
  const target: CompensationTarget = { kind: 'miller', index: millerIndex, field: 'cc' };
  const pm = (cc: number) => core(withValue(model, target, cc))?.loop.phaseMarginDeg ?? NaN;
  const uncompensated = core(withValue(model, target, 0));
  if (uncompensated && uncompensated.loop.ugfHz === undefined && uncompensated.loop.dcGain < 1) {
    return {
      ok: false,
      reason: `the loop gain (${uncompensated.loop.dcGain.toPrecision(3)} V/V at DC) never reaches unity, so phase margin is not defined`,
    };
  }
  const pm0 = pm(0);
  if (pm0 >= targetDeg) {
    return {
      ok: false,
      reason: `the loop already has ${pm0.toFixed(1)}° of phase margin without this capacitor`,
    };
  }
  const grid = logGrid(1e-18, 1e-6, 2);
  const { value, samples } = smallestCrossing((cc) => pm(cc) - targetDeg, grid);
  if (value === undefined) {
    let best = -Infinity;
    let at = NaN;
    samples.forEach((s, i) => {
      if (s > best) {
        best = s;
        at = grid[i];
      }
    });
    if (!Number.isFinite(best))
      return { ok: false, reason: 'the loop gain never crosses unity for any capacitor value' };
    return {
      ok: false,
      reason: `phase margin peaks at ${(best + targetDeg).toFixed(1)}° (near Cc = ${fmt(at, 'F')}), below the target ${targetDeg}°${gainNote(model, millerIndex)}`,
    };
  }
  const achieved = pm(value);
  const round = rounded(value, (v) => (pm(v) >= targetDeg ? pm(v) : undefined), true);
  return { ok: true, value, achieved, ...round, note: `phase margin ${achieved.toFixed(2)}°` };
}

/** Second pole by magnitude over the loop's unity-gain frequency (rad/s both), NaN when undefined. */
function p2OverUgf(r: CoreResult | undefined): number {
  if (!r || r.open.poles.length < 2 || r.loop.ugfHz === undefined) return NaN;
  return mag(r.open.poles[1]) / (2 * Math.PI * r.loop.ugfHz);
}

export function solveCcForNondominantPole(
  model: DesignModel,
  millerIndex: number,
  factor: number,
): SynthesisResult {
  const missing = millerExists(model, millerIndex);
  if (missing) return { ok: false, reason: missing };
  const target: CompensationTarget = { kind: 'miller', index: millerIndex, field: 'cc' };
  const ratio = (cc: number) => p2OverUgf(core(withValue(model, target, cc)));
  const grid = logGrid(1e-18, 1e-6, 2);
  const { value, samples } = smallestCrossing((cc) => Math.log(ratio(cc) / factor), grid);
  if (value === undefined) {
    const best = Math.max(...samples.filter(Number.isFinite));
    if (!Number.isFinite(best)) {
      return {
        ok: false,
        reason: 'the loop has no unity-gain crossing or fewer than two poles for any capacitor value',
      };
    }
    return {
      ok: false,
      reason: `the non-dominant pole reaches at most ${(factor * Math.exp(best)).toPrecision(3)}× the unity-gain frequency, below ${factor}×${gainNote(model, millerIndex)}`,
    };
  }
  const achieved = ratio(value);
  const round = rounded(value, (v) => (ratio(v) >= factor ? ratio(v) : undefined), true);
  return { ok: true, value, achieved, ...round, note: `p2 = ${achieved.toPrecision(4)} × UGF` };
}

/**
 * The high-frequency coefficient c·A^(ρ−1)·b at a fixed relative degree ρ: a property of the transfer
 * function, so it is comparable across values, and it passes through zero where a zero goes to infinity.
 */
function markov(model: DesignModel, rho: number): number {
  const built = buildNetwork(model);
  if (!built.ok) return NaN;
  const r = realize(built.network);
  if (!r.ok) return NaN;
  const { A, b, c, order: n } = r.system;
  let row = Float64Array.from(c);
  for (let k = 1; k < rho; k++) {
    const next = new Float64Array(n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) next[j] += row[i] * A[i * n + j];
    row = next;
  }
  let m = 0;
  for (let i = 0; i < n; i++) m += row[i] * b[i];
  return m;
}

function relativeDegree(model: DesignModel): number | undefined {
  const built = buildNetwork(model);
  if (!built.ok) return undefined;
  const r = realize(built.network);
  return r.ok ? zerosOf(r.system).relativeDegree : undefined;
}

export function solveRzForZeroAtInfinity(model: DesignModel, millerIndex: number): SynthesisResult {
  const missing = millerExists(model, millerIndex);
  if (missing) return { ok: false, reason: missing };
  if (!(model.millers[millerIndex].cc > 0))
    return { ok: false, reason: 'the Miller capacitor is zero, so there is no zero to move' };
  const target: CompensationTarget = { kind: 'miller', index: millerIndex, field: 'rz' };
  const grid = logGrid(1e-2, 1e9, 3);
  const degrees = grid
    .map((rz) => relativeDegree(withValue(model, target, rz)))
    .filter((d) => d !== undefined);
  if (degrees.length === 0)
    return { ok: false, reason: 'the design cannot be analysed with a nulling resistor' };
  const rho = Math.min(...(degrees as number[]));
  const f = (rz: number) => markov(withValue(model, target, rz), rho);
  const value = firstBracketedRoot(f, grid, (a, b) => a !== 0 && b !== 0 && Math.sign(a) !== Math.sign(b));
  if (value !== undefined) {
    const after = core(withValue(model, target, value));
    const finite = after ? after.open.zeros.filter((z) => z.im === 0).map(mag) : [];
    const largest = finite.length ? Math.max(...finite) : Infinity;
    const largestPole = after && after.open.poles.length ? Math.max(...after.open.poles.map(mag)) : 0;
    return {
      ok: true,
      value,
      achieved: largest / (2 * Math.PI),
      note: `the highest remaining real zero lies at ${Number.isFinite(largest) ? (largest / largestPole).toPrecision(3) + '× the highest pole' : 'infinity'}`,
    };
  }
  return { ok: false, reason: 'no nulling-resistor value between 10 mΩ and 1 GΩ moves the zero to infinity' };
}

export function solveRzToCancelPole(model: DesignModel, millerIndex: number): SynthesisResult {
  const missing = millerExists(model, millerIndex);
  if (missing) return { ok: false, reason: missing };
  const target: CompensationTarget = { kind: 'miller', index: millerIndex, field: 'rz' };
  // A real zero can only cancel a real pole: against a complex pair it would leave the pair in place and
  // add a low pole of its own (a very large Rz), so the target is refused instead of "met".
  const isComplex = (p: Complex) => Math.abs(p.im) > 1e-6 * mag(p);
  const now = core(model);
  if (now && now.open.poles.length >= 2 && isComplex(now.open.poles[1])) {
    return {
      ok: false,
      reason:
        'the first non-dominant poles are a complex pair; a real left-half-plane zero cannot cancel them',
    };
  }
  // ln(|z|/|p2|) for the lowest left-half-plane real zero; +large when there is none (zero at or beyond ∞).
  const f = (rz: number) => {
    const r = core(withValue(model, target, rz));
    if (!r || r.open.poles.length < 2) return NaN;
    const lhp = r.open.zeros.filter((z) => z.im === 0 && z.re < 0).map(mag);
    if (lhp.length === 0) return 50;
    return Math.log(Math.min(...lhp) / mag(r.open.poles[1]));
  };
  const grid = logGrid(1e-2, 1e9, 4);
  const value = firstBracketedRoot(f, grid, (a, b) => a > 0 && b <= 0);
  if (value !== undefined) {
    const r = core(withValue(model, target, value));
    if (r && isComplex(r.open.poles[1])) {
      return {
        ok: false,
        reason: 'where the zero meets the first non-dominant pole, that pole is one of a complex pair',
      };
    }
    const z = r?.open.zeros.filter((s) => s.im === 0 && s.re < 0).map(mag) ?? [];
    return {
      ok: true,
      value,
      achieved: z.length ? Math.min(...z) / (2 * Math.PI) : NaN,
      note: r ? `zero placed on the pole at ${fmt(mag(r.open.poles[1]) / (2 * Math.PI), 'Hz')}` : undefined,
    };
  }
  return {
    ok: false,
    reason: 'no nulling-resistor value places a left-half-plane zero on the first non-dominant pole',
  };
}

export function solveGmForZero(model: DesignModel, stageIndex: number, factor: number): SynthesisResult {
  const st = model.stages[stageIndex];
  if (!st) return { ok: false, reason: `the design has no stage number ${stageIndex + 1}` };
  // ln(z_rhp / (factor·UGF)) for the lowest right-half-plane zero; +large without one.
  const f = (gm: number) => {
    const r = core(withStageGm(model, stageIndex, gm));
    if (!r || r.loop.ugfHz === undefined) return NaN;
    const rhp = r.open.zeros.filter((z) => z.re > 0).map(mag);
    if (rhp.length === 0) return 50;
    return Math.log(Math.min(...rhp) / (factor * 2 * Math.PI * r.loop.ugfHz));
  };
  const now = core(model);
  if (now && !now.open.zeros.some((z) => z.re > 0)) {
    return { ok: false, reason: 'the design has no right-half-plane zero to place' };
  }
  const centre = st.gm > 0 ? st.gm : 1e-3;
  const grid = logGrid(centre * 1e-4, centre * 1e4, 3);
  const { value, samples } = smallestCrossing(f, grid);
  if (value === undefined) {
    const best = Math.max(...samples.filter(Number.isFinite));
    return {
      ok: false,
      reason: Number.isFinite(best)
        ? `the right-half-plane zero reaches at most ${(factor * Math.exp(best)).toPrecision(3)}× the unity-gain frequency for gm up to ${fmt(grid[grid.length - 1], 'S')}`
        : 'the loop has no unity-gain crossing for any transconductance value',
    };
  }
  const ratio = (gm: number) => {
    const y = f(gm);
    return Number.isNaN(y) ? undefined : factor * Math.exp(y);
  };
  const achieved = ratio(value) ?? NaN;
  const round = rounded(
    value,
    (v) => {
      const r = ratio(v);
      return r !== undefined && r >= factor ? r : undefined;
    },
    true,
  );
  return { ok: true, value, achieved, ...round, note: `RHP zero at ${achieved.toPrecision(4)} × UGF` };
}

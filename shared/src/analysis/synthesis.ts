// Solving a nulling resistor on the exact model: bracket on a logarithmic grid of the value, then Brent's
// method on the exact analysis; say why when no value reaches the target. (Fixes for margins and gm are
// solved on their rule's own quantity in checks/solveKnob.ts.)
import type { DesignModel } from '../language/model';
import type { Complex, SynthesisResult } from './types';
import { buildLoopNetwork } from './loopCore';
import type { CoreResult } from './core';
import { analyzeLoop } from './loopCore';
import { realize } from './realization';
import { zerosOf } from './polesZeros';
import { withValue, type CompensationTarget } from './variants';
import { brentRoot } from '../numeric/roots';
import { logGrid } from './loop';

const mag = (s: Complex) => Math.hypot(s.re, s.im);
const fmt = (x: number, unit: string) => `${x.toPrecision(3)} ${unit}`;

function core(model: DesignModel): CoreResult | undefined {
  try {
    const r = analyzeLoop(model, true);
    return r.ok ? r.result : undefined;
  } catch {
    return undefined;
  }
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

function millerExists(model: DesignModel, index: number): string | undefined {
  return model.millers[index] ? undefined : `the design has no Miller capacitor number ${index + 1}`;
}

/**
 * The high-frequency coefficient c·A^(ρ−1)·b at a fixed relative degree ρ: a property of the transfer
 * function, so it is comparable across values, and it passes through zero where a zero goes to infinity.
 */
function markov(model: DesignModel, rho: number): number {
  const built = buildLoopNetwork(model);
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
  const built = buildLoopNetwork(model);
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

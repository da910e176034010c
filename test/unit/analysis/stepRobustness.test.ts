// The step response on inputs at the edge of double precision: refused with a reason, in bounded time,
// never a hang or a throw; and the settling band of a response that returns to zero.
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../../shared/src/analysis';
import { loopResponse, openLoopResponse } from '../../../shared/src/analysis/responses';
import { stepResponse, type StepSystem } from '../../../shared/src/analysis/stepResponse';
import { buildModel, type ModelSpec } from './buildModel';

/** ẋ = −p·x + p·u, y = u − x: the high-pass y(t) = e^(−pt) for a unit step (first-order ODE, closed form). */
const highPass = (p: number): StepSystem => ({
  order: 1,
  A: Float64Array.of(-p),
  b: Float64Array.of(p),
  c: Float64Array.of(-1),
  d: 1,
});

/** ẋ = −p·x + p·u, y = x: the low-pass y(t) = 1 − e^(−pt) (closed form). */
const lowPass = (p: number): StepSystem => ({
  order: 1,
  A: Float64Array.of(-p),
  b: Float64Array.of(p),
  c: Float64Array.of(1),
  d: 0,
});

const twoStage = (over: { cc?: number; loadCap?: number; elements?: ModelSpec['elements'] }) =>
  buildModel({
    stages: [
      { name: 'first', input: 'in', gm: 1e-4, rout: 2e6, cap: 150e-15 },
      { name: 'second', input: 'first', gm: 3.5e-4, rout: 2e5, cap: 200e-15, inverting: true },
    ],
    loads: [{ cap: over.loadCap ?? 1e-12, res: 2e6 }],
    millers: [{ from: 'first', to: 'second', cc: over.cc ?? 1e-12 }],
    elements: over.elements ?? [],
  });

describe('step response at the edge of double precision', () => {
  it('refuses a settling tolerance it cannot judge, with the reason', () => {
    for (const tol of [5e-324, 1e-320, 1e-13, 0, -1e-3, NaN, Infinity, 1, 2]) {
      const r = stepResponse(lowPass(1e6), [{ re: -1e6, im: 0 }], 1, tol);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.reason).toMatch(/tolerance/);
    }
  });

  it('accepts the smallest tolerance it resolves: settling ln(1/tol)/p (first-order closed form)', () => {
    const p = 1e6;
    const r = stepResponse(lowPass(p), [{ re: -p, im: 0 }], 1, 1e-12);
    // The band is 1e-12 wide: an error of a few ulps (~1e-16) in y moves the crossing by about
    // 1e-4 / ln(1e12) of the time, hence the looser bound.
    expect(r.ok).toBe(true);
    if (r.ok)
      expect(Math.abs(r.step.settlingTime! - Math.log(1e12) / p) / (Math.log(1e12) / p)).toBeLessThan(1e-3);
  });

  it('measures the band of a response that returns to zero against its largest excursion', () => {
    // y = e^(−pt): peak 1 at t = 0, inside ±tol·1 from t = ln(1/tol)/p (closed form).
    const p = 2e5;
    const r = stepResponse(highPass(p), [{ re: -p, im: 0 }], 0, 1e-3);
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.step.overshootPct).toBe(0);
      expect(Math.abs(r.step.settlingTime! - Math.log(1e3) / p) / (Math.log(1e3) / p)).toBeLessThan(1e-6);
    }
  });

  it('gives a reason when every closed-loop pole is at the origin (no time scale)', () => {
    const sys: StepSystem = {
      order: 1,
      A: Float64Array.of(0),
      b: Float64Array.of(1),
      c: Float64Array.of(1),
      d: 0,
    };
    const r = stepResponse(sys, [{ re: 0, im: 0 }], NaN, 1e-3);
    expect(r.ok).toBe(false);
  });

  it('refuses non-finite coefficients and poles', () => {
    const bad = { ...lowPass(1), A: Float64Array.of(NaN) };
    expect(stepResponse(bad, [{ re: -1, im: 0 }], 1, 1e-3).ok).toBe(false);
    expect(stepResponse(lowPass(1), [{ re: -Infinity, im: 0 }], 1, 1e-3).ok).toBe(false);
  });

  it.each([
    ['a Miller capacitor of 1e308 F', { cc: 1e308 }],
    ['a load capacitor of 1e308 F', { loadCap: 1e308 }],
    [
      'a resistor of 1e308 ohm',
      { elements: [{ kind: 'res' as const, a: 'second', b: 'gnd', value: 1e308 }] },
    ],
    ['a Miller capacitor of 1e300 F', { cc: 1e300 }],
  ])('%s: the analysis returns, and the step response is computed or refused with a reason', (_, over) => {
    const a = analyzeDesign(twoStage(over));
    expect(a.step !== undefined || a.stepUnavailable !== undefined || a.problems.length > 0).toBe(true);
    if (a.step) {
      for (const v of [...a.step.t, ...a.step.y, a.step.final]) expect(Number.isFinite(v)).toBe(true);
    }
  });

  it.each([1e308, 1e300, 1e-300, 5e-324])(
    'frequency responses with Cc = %s return (samples or problems)',
    (cc) => {
      const model = twoStage({ cc });
      const hz = [1, 1e3, 1e6, 1e9];
      for (const r of [openLoopResponse(model, hz), loopResponse(model, hz)]) {
        expect(r.magDb.length === hz.length || (r.problems?.length ?? 0) > 0).toBe(true);
      }
    },
  );

  it('a refused tolerance leaves the rest of the analysis intact', () => {
    const a = analyzeDesign(twoStage({}), { settleTolerance: 5e-324 });
    expect(a.step).toBeUndefined();
    expect(a.stepUnavailable).toMatch(/tolerance/);
    expect(a.problems).toEqual([]);
    expect(a.loop.ugfHz).toBeGreaterThan(0);
  });
});

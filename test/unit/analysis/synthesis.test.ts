// The nulling-resistor solvers, re-analysed on the exact model against the closed forms they meet.
import { describe, expect, it } from 'vitest';
import {
  analyzeDesign,
  solveRzForZeroAtInfinity,
  solveRzToCancelPole,
  withValue,
} from '../../../shared/src/analysis';
import { relErr, twoStage } from './buildModel';

const base = { gm1: 100e-6, r1: 2e6, c1: 100e-15, gm2: 2e-3, r2: 100e3, c2: 2e-12, cc: 1e-12 };
const model = twoStage(base);
const rz = { kind: 'miller' as const, index: 0, field: 'rz' as const };

describe('synthesis', () => {
  it('Rz for a zero at infinity is 1/gm2 in the classic case', () => {
    const r = solveRzForZeroAtInfinity(model, 0);
    expect(r.ok).toBe(true);
    // z = 1/(Cc(1/gm2 − Rz)) → ∞ at Rz = 1/gm2 (GHLM ch. 9, from memory).
    if (r.ok) expect(relErr(r.value, 1 / base.gm2)).toBeLessThan(1e-9);
  });

  it('Rz to cancel the first non-dominant pole puts the zero on it', () => {
    const r = solveRzToCancelPole(model, 0);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const a = analyzeDesign(withValue(model, rz, r.value), { step: false });
    const lhp = a.zeros.filter((z) => z.s.re < 0 && z.s.im === 0);
    expect(lhp).toHaveLength(1);
    expect(relErr(Math.abs(lhp[0].s.re), Math.abs(a.poles[1].s.re))).toBeLessThan(1e-8);
    // Near the common choice Rz ≈ (1/gm2)(1 + C2/Cc) (common practice), within a factor of two here.
    const usual = (1 / base.gm2) * (1 + base.c2 / base.cc);
    expect(r.value / usual).toBeGreaterThan(0.5);
    expect(r.value / usual).toBeLessThan(2);
  });
});

// Every solved value is re-analysed on the exact model; unreachable targets must say why.
import { describe, expect, it } from 'vitest';
import {
  analyzeDesign,
  solveCcForNondominantPole,
  solveCcForPhaseMargin,
  solveGmForZero,
  solveRzForZeroAtInfinity,
  solveRzToCancelPole,
  withStageGm,
  withValue,
} from '../../../shared/src/analysis';
import { relErr, twoStage } from './buildModel';

const base = { gm1: 100e-6, r1: 2e6, c1: 100e-15, gm2: 2e-3, r2: 100e3, c2: 2e-12, cc: 1e-12 };
const model = twoStage(base);
const cc = { kind: 'miller' as const, index: 0, field: 'cc' as const };
const rz = { kind: 'miller' as const, index: 0, field: 'rz' as const };

describe('synthesis', () => {
  it('Cc for a phase margin really gives that phase margin', () => {
    for (const target of [45, 60, 70]) {
      const r = solveCcForPhaseMargin(model, 0, target);
      expect(r.ok).toBe(true);
      if (!r.ok) continue;
      const pm = analyzeDesign(withValue(model, cc, r.value), { step: false }).loop.phaseMarginDeg!;
      expect(Math.abs(pm - target)).toBeLessThan(1e-6);
      // The rounded value still meets the target when re-analysed.
      const pmRounded = analyzeDesign(withValue(model, cc, r.rounded!), { step: false }).loop.phaseMarginDeg!;
      expect(pmRounded).toBeGreaterThanOrEqual(target);
      expect(r.roundedAchieved).toBeCloseTo(pmRounded, 9);
    }
  });

  it('says why a phase margin is unreachable: it peaks below the target', () => {
    // The RHP zero gm2/Cc follows Cc down, so the margin has a maximum below 89°.
    const r = solveCcForPhaseMargin(model, 0, 89.5);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/peaks at .* below the target 89.5°/);
  });

  it('says why when the second stage has too little gain to split the poles', () => {
    const weak = twoStage({ ...base, gm2: 2e-6, r2: 1e5 });
    const r = solveCcForPhaseMargin(weak, 0, 60);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/gain of only/);
  });

  it('Cc for p2 ≥ factor·UGF gives p2/UGF = factor, and is the smallest such value', () => {
    const r = solveCcForNondominantPole(model, 0, 2.2);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const ratio = (c: number) => {
      const a = analyzeDesign(withValue(model, cc, c), { step: false });
      return Math.abs(a.poles[1].s.re) / (2 * Math.PI * a.loop.ugfHz!);
    };
    expect(relErr(ratio(r.value), 2.2)).toBeLessThan(1e-8);
    expect(ratio(r.value * 0.99)).toBeLessThan(2.2);
  });

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

  it('gm2 placing the RHP zero at factor·UGF does so when re-analysed', () => {
    const r = solveGmForZero(model, 1, 10);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const a = analyzeDesign(withStageGm(model, 1, r.value), { step: false });
    const z = a.zeros.find((x) => x.rhp)!;
    expect(relErr(z.hz / a.loop.ugfHz!, 10)).toBeLessThan(1e-8);
  });

  it('reports a missing compensation element or stage', () => {
    const r = solveCcForPhaseMargin(model, 3, 60);
    expect(r.ok).toBe(false);
    const g = solveGmForZero(model, 7, 10);
    expect(g.ok).toBe(false);
  });

  it('reports no RHP zero to place when a nulling resistor already moved it', () => {
    const r = solveGmForZero(withValue(model, rz, 2000), 1, 10);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/no right-half-plane zero/);
  });
});

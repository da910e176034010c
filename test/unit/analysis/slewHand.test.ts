import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../../shared/src/analysis';
import { buildModel, relErr, twoStage } from './buildModel';

describe('slew rate', () => {
  it('is the smaller of I_tail/Cc and I_out/(Cc + CL + C_out)', () => {
    const model = buildModel({
      stages: [
        { name: 'a', input: 'in', gm: 1e-4, rout: 1e6, cap: 1e-13, bias: 10e-6 },
        { name: 'b', input: 'a', gm: 1e-3, rout: 1e5, cap: 0.5e-12, inverting: true, bias: 100e-6 },
      ],
      loads: [{ cap: 3e-12 }],
      millers: [{ from: 'a', to: 'b', cc: 1e-12 }],
    });
    const a = analyzeDesign(model, { step: false });
    // SR = min(I_tail/Cc, I_2/(Cc + CL)) (Allen & Holberg ch. 6, from memory), with the output node's own
    // capacitance added to what the output stage charges.
    const first = 10e-6 / 1e-12;
    const second = 100e-6 / (1e-12 + 3e-12 + 0.5e-12);
    expect(a.slew!.limits).toHaveLength(2);
    expect(relErr(a.slew!.limits[0].rate, first)).toBeLessThan(1e-12);
    expect(relErr(a.slew!.limits[1].rate, second)).toBeLessThan(1e-12);
    expect(a.slew!.rate).toBe(Math.min(first, second));
  });

  it('is absent when no stage states a bias current', () => {
    expect(
      analyzeDesign(twoStage({ gm1: 1e-4, r1: 1e6, c1: 1e-13, gm2: 1e-3, r2: 1e5, c2: 1e-12, cc: 1e-12 }))
        .slew,
    ).toBe(undefined);
  });
});

describe('hand estimates', () => {
  it('compare the classic formulas with the exact roots', () => {
    const p = { gm1: 1e-4, r1: 1e6, c1: 1e-13, gm2: 1e-3, r2: 1e5, c2: 2e-12, cc: 1e-12 };
    const a = analyzeDesign(twoStage(p), { step: false });
    const hand = a.hand!;
    expect(hand.map((h) => h.quantity)).toEqual(['dominant-pole', 'nondominant-pole', 'zero']);
    // 1/(gm2R1R2Cc), gm2Cc/(C1C2 + Cc(C1 + C2)), gm2/Cc: GHLM ch. 9, Allen & Holberg ch. 6 (from memory).
    expect(hand[0].hand).toBeCloseTo(1 / (p.gm2 * p.r1 * p.r2 * p.cc), 6);
    expect(hand[1].hand).toBeCloseTo((p.gm2 * p.cc) / (p.c1 * p.c2 + p.cc * (p.c1 + p.c2)), 0);
    expect(hand[2].hand).toBeCloseTo(p.gm2 / p.cc, 0);
    for (const h of hand) {
      expect(h.exact).toBeGreaterThan(0);
      expect(h.relativeError).toBeCloseTo(Math.abs(h.hand - h.exact) / h.exact, 12);
    }
    expect(hand[0].exact).toBeCloseTo(Math.abs(a.poles[0].s.re), 6);
    // With gm2R ≫ 1 the pole estimates are within a few percent (common practice) and the zero is exact.
    expect(hand[0].relativeError).toBeLessThan(0.05);
    expect(hand[2].relativeError).toBeLessThan(1e-12);
  });

  it('flags a poor non-dominant estimate when the second stage is weak', () => {
    const p = { gm1: 1e-4, r1: 1e6, c1: 1e-12, gm2: 2e-5, r2: 1e5, c2: 2e-12, cc: 1e-12 };
    const hand = analyzeDesign(twoStage(p), { step: false }).hand!;
    expect(hand[1].relativeError).toBeGreaterThan(0.2);
  });

  it('are absent for a design that is not the classic two-stage case', () => {
    const model = buildModel({
      stages: [{ name: 'a', input: 'in', gm: 1e-4, rout: 1e6, cap: 1e-12 }],
    });
    expect(analyzeDesign(model).hand).toBeUndefined();
  });
});

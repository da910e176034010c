// The pole-splitting facts of the two-stage Miller amplifier as property tests. Denominator
// D(s) = 1 + s[(C1+Cc)R1 + (C2+Cc)R2 + gm2R1R2Cc] + s²R1R2(C1C2 + Cc(C1+C2)) (Gray, Hurst, Lewis & Meyer
// ch. 9, from memory; re-derived); the facts below follow from both coefficients being affine in Cc
// (derived by evaluating D at the uncompensated poles).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analyzeDesign } from '../../../shared/src/analysis';
import { twoStage } from './buildModel';

const logUniform = (lo: number, hi: number) =>
  fc.double({ min: Math.log10(lo), max: Math.log10(hi), noNaN: true }).map((e) => 10 ** e);

const design = fc.record({
  gm1: logUniform(1e-6, 1e-3),
  r1: logUniform(1e4, 1e8),
  c1: logUniform(1e-15, 1e-11),
  gm2: logUniform(1e-6, 1e-1),
  r2: logUniform(1e3, 1e7),
  c2: logUniform(1e-15, 1e-10),
});

const poleMags = (p: Parameters<typeof twoStage>[0]) =>
  analyzeDesign(twoStage(p), { step: false }).poles.map((x) => Math.hypot(x.s.re, x.s.im));

describe('pole splitting', () => {
  it('both poles stay real for every Cc ≥ 0', () => {
    fc.assert(
      fc.property(design, logUniform(1e-16, 1e-9), (d, cc) => {
        for (const c of [0, cc]) {
          const a = analyzeDesign(twoStage({ ...d, cc: c }), { step: false });
          expect(a.poles).toHaveLength(2);
          for (const p of a.poles) expect(p.s.im).toBe(0);
        }
      }),
      { numRuns: 300, seed: 11 },
    );
  });

  it('the lower pole lies below the lower uncompensated pole and only moves down as Cc grows', () => {
    let outputSlower = 0;
    fc.assert(
      fc.property(design, logUniform(1e-16, 1e-9), logUniform(1.01, 100), (d, cc, k) => {
        const lowerUncompensated = Math.min(1 / (d.r1 * d.c1), 1 / (d.r2 * d.c2));
        if (d.r2 * d.c2 > d.r1 * d.c1) outputSlower++;
        const [low] = poleMags({ ...d, cc });
        const [lowMore] = poleMags({ ...d, cc: cc * k });
        expect(low).toBeLessThan(lowerUncompensated);
        expect(lowMore).toBeLessThan(low);
      }),
      { numRuns: 300, seed: 12 },
    );
    // The draws include designs where the output node is the slower one before compensation.
    expect(outputSlower).toBeGreaterThan(30);
  });

  it('the higher pole is above the higher uncompensated pole exactly when the stated condition holds', () => {
    let holds = 0;
    let fails = 0;
    fc.assert(
      fc.property(design, logUniform(1e-16, 1e-9), (d, cc) => {
        const higherUncompensated = Math.max(1 / (d.r1 * d.c1), 1 / (d.r2 * d.c2));
        const condition =
          (d.gm2 + 1 / d.r2) / d.c2 > 1 / (d.r1 * d.c1) && (d.gm2 + 1 / d.r1) / d.c1 > 1 / (d.r2 * d.c2);
        const [, high] = poleMags({ ...d, cc });
        if (condition) {
          holds++;
          expect(high).toBeGreaterThan(higherUncompensated);
        } else {
          fails++;
          expect(high).toBeLessThan(higherUncompensated);
        }
      }),
      { numRuns: 400, seed: 13 },
    );
    expect(holds).toBeGreaterThan(20);
    expect(fails).toBeGreaterThan(5);
  });

  it('as Cc → ∞ the higher pole tends to (gm2 + 1/R1 + 1/R2)/(C1 + C2) and the lower to 1/(Cc(R1 + R2 + gm2R1R2))', () => {
    fc.assert(
      fc.property(design, (d) => {
        const cc = 1e9 * Math.max(d.c1, d.c2);
        const [low, high] = poleMags({ ...d, cc });
        const highLimit = (d.gm2 + 1 / d.r1 + 1 / d.r2) / (d.c1 + d.c2);
        const lowLimit = 1 / (cc * (d.r1 + d.r2 + d.gm2 * d.r1 * d.r2));
        expect(Math.abs(high - highLimit) / highLimit).toBeLessThan(1e-5);
        expect(Math.abs(low - lowLimit) / lowLimit).toBeLessThan(1e-5);
      }),
      { numRuns: 200, seed: 14 },
    );
  });

  it('with a large second-stage gain the lower pole approaches 1/(gm2·R1·R2·Cc)', () => {
    fc.assert(
      fc.property(design, (d) => {
        // Lower-pole estimate 1/(gm2R1R2Cc): GHLM ch. 9, Allen & Holberg ch. 6 (from memory). Its error
        // is (R1 + R2)/(gm2R1R2) at large Cc, so draw gm2·R ≥ 1000.
        fc.pre(d.gm2 * d.r1 >= 1000 && d.gm2 * d.r2 >= 1000);
        const cc = 1e6 * Math.max(d.c1, d.c2);
        const [low] = poleMags({ ...d, cc });
        const estimate = 1 / (d.gm2 * d.r1 * d.r2 * cc);
        expect(Math.abs(low - estimate) / estimate).toBeLessThan(3e-3);
      }),
      { numRuns: 200, seed: 15 },
    );
  });

  it('the uncompensated network (Cc = 0) has exactly the poles 1/(R1C1) and 1/(R2C2)', () => {
    fc.assert(
      fc.property(design, (d) => {
        const got = poleMags({ ...d, cc: 0 });
        const want = [1 / (d.r1 * d.c1), 1 / (d.r2 * d.c2)].sort((a, b) => a - b);
        got.forEach((g, i) => expect(Math.abs(g - want[i]) / want[i]).toBeLessThan(1e-12));
      }),
      { numRuns: 100, seed: 16 },
    );
  });
});

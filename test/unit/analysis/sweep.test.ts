import { describe, expect, it } from 'vitest';
import { analyzeDesign, sweepCompensation, withValue } from '../../../shared/src/analysis';
import { relErr, twoStage } from './buildModel';

const base = { gm1: 100e-6, r1: 2e6, c1: 100e-15, gm2: 2e-3, r2: 100e3, c2: 2e-12, cc: 1e-12 };

describe('compensation sweep', () => {
  it('matches a fresh analysis at every value, with Cc = 0 giving the uncompensated poles', () => {
    const model = twoStage(base);
    const target = { kind: 'miller' as const, index: 0, field: 'cc' as const };
    const values = [0, ...Array.from({ length: 40 }, (_, i) => 1e-16 * 10 ** (i / 8))];
    const locus = sweepCompensation(model, target, values);
    expect(locus).toHaveLength(values.length);
    // Uncompensated: 1/(R1C1) and 1/(R2C2) (elementary).
    const unc = [1 / (base.r2 * base.c2), 1 / (base.r1 * base.c1)].sort((a, b) => a - b);
    locus[0].poles.forEach((p, i) => expect(relErr(-p.re, unc[i])).toBeLessThan(1e-12));
    expect(locus[0].zeros).toEqual([]);
    for (const pt of locus.slice(1)) {
      const a = analyzeDesign(withValue(model, target, pt.value), { step: false });
      pt.poles.forEach((p, i) => expect(relErr(p.re, a.poles[i].s.re)).toBeLessThan(1e-9));
      pt.zeros.forEach((z, i) => expect(relErr(z.re, a.zeros[i].s.re)).toBeLessThan(1e-9));
    }
  });

  it('sweeps a nulling resistor, including Rz = 0', () => {
    const model = twoStage({ ...base, rz: 100 });
    const target = { kind: 'miller' as const, index: 0, field: 'rz' as const };
    const locus = sweepCompensation(model, target, [0, 100, 500, 1000]);
    expect(locus.map((p) => p.poles.length)).toEqual([2, 3, 3, 3]);
    // Zero 1/(Cc(1/gm2 − Rz)) (GHLM ch. 9, from memory).
    expect(relErr(locus[3].zeros[0].re, 1 / (base.cc * (1 / base.gm2 - 1000)))).toBeLessThan(1e-8);
  });

  it('stops when cancelled', () => {
    const model = twoStage(base);
    let calls = 0;
    const token = {
      get isCancellationRequested() {
        return ++calls > 5;
      },
    };
    const locus = sweepCompensation(
      model,
      { kind: 'miller', index: 0, field: 'cc' },
      [1, 2, 3, 4, 5, 6, 7, 8].map((x) => x * 1e-13),
      token,
    );
    expect(locus.length).toBe(5);
  });
});

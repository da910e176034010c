// Degenerate and extreme networks: charge-free nodes, a lone capacitor, zero gm, extreme values, complex
// pairs, wide spreads, modelling errors. The engine must answer exactly or say what is wrong, never throw.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analyzeDesign, buildNetwork } from '../../../shared/src/analysis';
import type { DesignModel } from '../../../shared/src/language/model';
import { buildModel, quadraticRoots, relErr, twoStage } from './buildModel';

const base = { gm1: 100e-6, r1: 2e6, c1: 100e-15, gm2: 2e-3, r2: 100e3, c2: 2e-12, cc: 1e-12 };

/** Roots of the two-stage denominator (GHLM ch. 9, from memory; re-derived), dropping a vanishing s² term. */
function twoStageRoots(p: typeof base): number[] {
  const b1 = (p.c1 + p.cc) * p.r1 + (p.c2 + p.cc) * p.r2 + p.gm2 * p.r1 * p.r2 * p.cc;
  const b2 = p.r1 * p.r2 * (p.c1 * p.c2 + p.cc * (p.c1 + p.c2));
  if (b2 === 0) return [-1 / b1];
  return quadraticRoots(b2, b1, 1).map((r) => r.re);
}

describe('degenerate networks', () => {
  it('a node without capacitance: one pole fewer, still exact', () => {
    const p = { ...base, c1: 0, cc: 0 };
    const a = analyzeDesign(twoStage(p));
    expect(a.problems).toEqual([]);
    // Only the output holds charge: a single pole 1/(R2C2) (elementary).
    expect(a.poles).toHaveLength(1);
    expect(relErr(a.poles[0].s.re, -1 / (p.r2 * p.c2))).toBeLessThan(1e-12);
    expect(relErr(a.dcGain, -p.gm1 * p.r1 * p.gm2 * p.r2)).toBeLessThan(1e-12);
  });

  it('Cc as the only capacitor: one pole at −1/(Cc(R1 + R2 + gm2R1R2)) and the zero +gm2/Cc', () => {
    const p = { ...base, c1: 0, c2: 0 };
    const a = analyzeDesign(twoStage(p));
    expect(a.poles).toHaveLength(1);
    expect(relErr(a.poles[0].s.re, twoStageRoots(p)[0])).toBeLessThan(1e-12);
    expect(a.zeros).toHaveLength(1);
    expect(relErr(a.zeros[0].s.re, p.gm2 / p.cc)).toBeLessThan(1e-12);
  });

  it('gm2 = 0: the output follows only through Cc, so the zero is at the origin and the DC gain is 0', () => {
    const p = { ...base, gm2: 0 };
    const a = analyzeDesign(twoStage(p));
    expect(a.problems).toEqual([]);
    expect(a.dcGain).toBe(0);
    // gm2/Cc = 0 (GHLM ch. 9 with gm2 = 0).
    expect(a.zeros).toHaveLength(1);
    expect(a.zeros[0].s).toEqual({ re: 0, im: 0 });
    a.poles.forEach((q, i) => expect(relErr(q.s.re, twoStageRoots(p)[i])).toBeLessThan(1e-10));
  });

  it('gm1 = 0: no transfer at all, reported as zero gain without roots in the numerator', () => {
    const a = analyzeDesign(twoStage({ ...base, gm1: 0 }));
    expect(a.problems).toEqual([]);
    expect(a.dcGain).toBe(0);
    expect(a.zeros).toEqual([]);
    expect(a.poles).toHaveLength(2);
  });

  it('scales exactly from attofarads to millifarads', () => {
    for (const k of [1e-6, 1e-3, 1, 1e3, 1e6, 1e9]) {
      // Capacitors ×k (100 fF → 100 aF … 100 µF … 1 mF for the 1 pF ones at k = 1e9): poles ÷k.
      const p = { ...base, c1: base.c1 * k, c2: base.c2 * k, cc: base.cc * k };
      const a = analyzeDesign(twoStage(p), { step: false });
      twoStageRoots(p).forEach((r, i) => expect(relErr(a.poles[i].s.re, r)).toBeLessThan(1e-10));
      expect(relErr(a.zeros[0].s.re, p.gm2 / p.cc)).toBeLessThan(1e-10);
    }
  });

  it('1 aF beside 1 mF in one network', () => {
    const p = { ...base, c1: 1e-18, c2: 1e-3, cc: 1e-15 };
    const a = analyzeDesign(twoStage(p), { step: false });
    twoStageRoots(p).forEach((r, i) => expect(relErr(a.poles[i].s.re, r)).toBeLessThan(1e-9));
    expect(relErr(a.zeros[0].s.re, p.gm2 / p.cc)).toBeLessThan(1e-9);
  });

  it('poles 12 decades apart, isolated and loaded', () => {
    // Isolated by an ideal buffer: 1/(R1C1) = 1 rad/s and 1/(R2C2) = 1e12 rad/s (elementary).
    const isolated = buildModel({
      stages: [
        { name: 'n1', input: 'in', gm: 1e-6, rout: 1e6, cap: 1e-6 },
        { name: 'n2', input: 'n1', gm: 1e-3, rout: 1e3, cap: 1e-15 },
      ],
    });
    const a = analyzeDesign(isolated);
    expect(relErr(a.poles[0].s.re, -1)).toBeLessThan(1e-12);
    expect(relErr(a.poles[1].s.re, -1e12)).toBeLessThan(1e-12);
    // Loaded ladder: s²R1C1R2C2 + s(R1C1 + R2C2 + R1C2) + 1 (re-derived by nodal analysis).
    const [r1, c1, r2, c2] = [1e6, 1e-6, 1e3, 1e-15];
    const loaded = buildModel({
      stages: [],
      nodes: ['n1', 'n2'],
      output: 'n2',
      elements: [
        { kind: 'res', a: 'in', b: 'n1', value: r1 },
        { kind: 'cap', a: 'n1', b: 'gnd', value: c1 },
        { kind: 'res', a: 'n1', b: 'n2', value: r2 },
        { kind: 'cap', a: 'n2', b: 'gnd', value: c2 },
      ],
    });
    const b = analyzeDesign(loaded);
    const want = quadraticRoots(r1 * c1 * r2 * c2, r1 * c1 + r2 * c2 + r1 * c2, 1);
    b.poles.forEach((p, i) => expect(relErr(p.s.re, want[i].re)).toBeLessThan(1e-10));
    expect(b.step!.settlingTime).toBeGreaterThan(1);
  });

  it('a complex pole pair from a gyrator: (−g ± j·gm)/C', () => {
    const [g, gm, c] = [1e-5, 1e-3, 1e-12];
    const model = buildModel({
      stages: [],
      nodes: ['x', 'y'],
      output: 'y',
      elements: [
        { kind: 'res', a: 'x', b: 'gnd', value: 1 / g },
        { kind: 'res', a: 'y', b: 'gnd', value: 1 / g },
        { kind: 'cap', a: 'x', b: 'gnd', value: c },
        { kind: 'cap', a: 'y', b: 'gnd', value: c },
        { kind: 'gm', control: 'y', output: 'x', value: gm, inverting: true },
        { kind: 'gm', control: 'x', output: 'y', value: gm },
        { kind: 'gm', control: 'in', output: 'x', value: 1e-4 },
      ],
    });
    const a = analyzeDesign(model);
    // det(G + sC) = (g + sC)² + gm² (elementary).
    expect(a.poles).toHaveLength(2);
    expect(relErr(a.poles[0].s.re, -g / c)).toBeLessThan(1e-12);
    expect(relErr(Math.abs(a.poles[0].s.im), gm / c)).toBeLessThan(1e-12);
    expect(a.poles[0].s.im).toBe(-a.poles[1].s.im);
    expect(relErr(a.poles[0].damping, g / Math.hypot(g, gm))).toBeLessThan(1e-12);
    // Equal capacitances and a lossless coupling share the pair evenly.
    expect(a.poles[0].namedAfter).toBe('shared');
    expect(a.poles[0].participation[0].share).toBeCloseTo(0.5, 9);
  });

  it('pole count equals the rank of C: two nodes joined only by a floating capacitor give one pole', () => {
    const model = buildModel({
      stages: [
        { name: 'a', input: 'in', gm: 1e-4, rout: 1e5 },
        { name: 'b', input: 'a', gm: 1e-4, rout: 1e5 },
      ],
      elements: [{ kind: 'cap', a: 'a', b: 'b', value: 1e-12 }],
    });
    const built = buildNetwork(model);
    expect(built.ok && built.network.capRank).toBe(1);
    const a = analyzeDesign(model);
    expect(a.poles).toHaveLength(1);
    // Nodal analysis: G = [[g, 0], [−gm, g]], C = C·[[1, −1], [−1, 1]], so
    // det(G + sC) = (g + sC)² − sC(gm + sC) = g² + sC(2g − gm) → s = −g²/(C(2g − gm)), here in the RHP.
    const g = 1e-5;
    expect(relErr(a.poles[0].s.re, -(g * g) / (1e-12 * (2 * g - 1e-4)))).toBeLessThan(1e-12);
    expect(a.poles[0].s.re).toBeGreaterThan(0);
  });

  it('reports modelling errors by node instead of throwing', () => {
    const floating = buildModel({
      stages: [
        { name: 'a', input: 'in', gm: 1e-4, rout: 1e5, cap: 1e-12 },
        { name: 'b', input: 'lost', gm: 1e-4, rout: 1e5, cap: 1e-12 },
      ],
      nodes: ['lost'],
    });
    const a = analyzeDesign(floating);
    expect(a.problems[0].node).toBe('lost');
    expect(a.problems[0].message).toMatch(/no DC path and no capacitance/);
    const shorted = analyzeDesign(twoStage({ ...base, r2: 0 }));
    expect(shorted.problems[0].message).toMatch(/rout is zero/);
    const nan = analyzeDesign(twoStage({ ...base, gm2: NaN }));
    expect(nan.problems[0].message).toMatch(/not a finite number/);
  });

  it('never throws on arbitrary (even nonsensical) models', () => {
    const value = fc.oneof(fc.double(), fc.constantFrom(0, -1, 1e-30, 1e30, Infinity, NaN));
    const names = ['in', 'a', 'b', 'c', 'gnd', 'ghost'];
    fc.assert(
      fc.property(
        fc.array(
          fc.record({
            input: fc.constantFrom(...names),
            gm: value,
            rout: value,
            cap: value,
            inv: fc.boolean(),
          }),
          {
            maxLength: 4,
          },
        ),
        fc.array(
          fc.record({
            kind: fc.constantFrom<'res' | 'cap'>('res', 'cap'),
            a: fc.constantFrom(...names),
            b: fc.constantFrom(...names),
            v: value,
          }),
          {
            maxLength: 4,
          },
        ),
        fc.array(
          fc.record({ from: fc.constantFrom(...names), to: fc.constantFrom(...names), cc: value, rz: value }),
          { maxLength: 2 },
        ),
        (stages, elements, millers) => {
          const stageNames = ['a', 'b', 'c'];
          let model: DesignModel;
          try {
            model = buildModel({
              stages: stages.map((s, i) => ({
                name: stageNames[i % 3],
                input: s.input,
                gm: s.gm,
                rout: s.rout,
                cap: s.cap,
                inverting: s.inv,
              })),
              nodes: ['a'],
              output: 'a',
              elements: elements.map((e) => ({ kind: e.kind, a: e.a, b: e.b, value: e.v })),
              millers: millers.filter((m) => m.from !== 'gnd' && m.to !== 'gnd'),
            });
          } catch {
            return;
          }
          const a = analyzeDesign(model);
          expect(Array.isArray(a.problems)).toBe(true);
        },
      ),
      { numRuns: 500, seed: 21 },
    );
  });
});

import { describe, expect, it } from 'vitest';
import { analyzeDesign, buildNetwork } from '../../../shared/src/analysis';
import { buildModel, quadraticRoots, relErr, twoStage } from './buildModel';

const base = { gm1: 100e-6, r1: 2e6, c1: 100e-15, gm2: 2e-3, r2: 100e3, c2: 2e-12, cc: 1e-12 };

describe('two-stage Miller amplifier', () => {
  it('poles are the roots of the closed-form denominator and the zero is +gm2/Cc', () => {
    const { gm1, r1, c1, gm2, r2, c2, cc } = base;
    const a = analyzeDesign(twoStage(base));
    expect(a.problems).toEqual([]);
    // D(s) = 1 + s[(C1+Cc)R1 + (C2+Cc)R2 + gm2R1R2Cc] + s²R1R2(C1C2 + Cc(C1+C2)), zero +gm2/Cc:
    // Gray, Hurst, Lewis & Meyer ch. 9 (from memory; re-derived by nodal analysis).
    const b1 = (c1 + cc) * r1 + (c2 + cc) * r2 + gm2 * r1 * r2 * cc;
    const b2 = r1 * r2 * (c1 * c2 + cc * (c1 + c2));
    const expected = quadraticRoots(b2, b1, 1);
    expect(a.poles).toHaveLength(2);
    a.poles.forEach((p, i) => {
      expect(p.s.im).toBe(0);
      expect(relErr(p.s.re, expected[i].re)).toBeLessThan(1e-10);
    });
    expect(a.zeros).toHaveLength(1);
    expect(relErr(a.zeros[0].s.re, gm2 / cc)).toBeLessThan(1e-10);
    expect(a.zeros[0].rhp).toBe(true);
    // DC gain (+gm1·R1)·(−gm2·R2) of the cascade (direct nodal reasoning).
    expect(relErr(a.dcGain, -gm1 * r1 * gm2 * r2)).toBeLessThan(1e-12);
  });

  it('a nulling resistor moves the zero to 1/(Cc(1/gm2 − Rz)) and adds a third pole', () => {
    for (const rz of [100, 250, 499, 501, 1000, 5000]) {
      const a = analyzeDesign(twoStage({ ...base, rz }));
      expect(a.problems).toEqual([]);
      expect(a.poles).toHaveLength(3);
      // Zero 1/(Cc(1/gm2 − Rz)): GHLM ch. 9, Allen & Holberg ch. 6 (from memory; re-derived).
      const z = 1 / (base.cc * (1 / base.gm2 - rz));
      expect(a.zeros).toHaveLength(1);
      expect(relErr(a.zeros[0].s.re, z)).toBeLessThan(1e-8);
      expect(a.zeros[0].rhp).toBe(z > 0);
    }
  });

  it('Rz = 1/gm2 puts the zero at infinity', () => {
    const a = analyzeDesign(twoStage({ ...base, rz: 1 / base.gm2 }));
    expect(a.poles).toHaveLength(3);
    // Zero 1/(Cc(1/gm2 − Rz)) → ∞ (GHLM ch. 9, from memory).
    expect(a.zeros.every((z) => Math.abs(z.s.re) > 1e6 * Math.abs(a.poles[2].s.re))).toBe(true);
  });
});

describe('RC ladders', () => {
  it('two loaded RC sections have the poles of s²R1C1R2C2 + s(R1C1 + R2C2 + R1C2) + 1', () => {
    const [r1, c1, r2, c2] = [1e3, 1e-9, 10e3, 1e-10];
    // vin –R1– n1 (C1 to ground) –R2– n2 (C2 to ground); a unity gm from the input keeps the source ideal.
    const model = buildModel({
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
    const a = analyzeDesign(model);
    expect(a.problems).toEqual([]);
    // Loaded RC ladder denominator, any circuits text (e.g. Razavi ch. 6; re-derived by nodal analysis).
    const expected = quadraticRoots(r1 * c1 * r2 * c2, r1 * c1 + r2 * c2 + r1 * c2, 1);
    a.poles.forEach((p, i) => expect(relErr(p.s.re, expected[i].re)).toBeLessThan(1e-10));
    expect(relErr(a.dcGain, 1)).toBeLessThan(1e-12);
    // Loading shares each pole between the nodes.
    expect(a.poles.every((p) => p.participation[1].share > 0.02)).toBe(true);
  });

  it('an ideal buffer between two RC sections gives 1/(R1C1) and 1/(R2C2) with 100 % participation', () => {
    const [r1, c1, r2, c2] = [1e3, 1e-9, 10e3, 1e-12];
    const model = buildModel({
      stages: [
        { name: 'n1', input: 'in', gm: 1 / r1, rout: r1, cap: c1 },
        { name: 'n2', input: 'n1', gm: 1 / r2, rout: r2, cap: c2 },
      ],
    });
    const a = analyzeDesign(model);
    // Isolated sections: poles 1/(R1C1), 1/(R2C2) (elementary RC result).
    const expected = [-1 / (r1 * c1), -1 / (r2 * c2)].sort((x, y) => Math.abs(x) - Math.abs(y));
    a.poles.forEach((p, i) => {
      expect(relErr(p.s.re, expected[i])).toBeLessThan(1e-12);
      expect(p.participation[0].share).toBeCloseTo(1, 12);
    });
    expect(a.poles[0].namedAfter).toBe('n1');
    expect(a.poles[1].namedAfter).toBe('n2');
  });
});

describe('buildNetwork', () => {
  it('creates an internal node for a nulling resistor and one for a current buffer', () => {
    const model = buildModel({
      stages: [
        { name: 'a', input: 'in', gm: 1e-4, rout: 1e6, cap: 1e-13 },
        { name: 'b', input: 'a', gm: 1e-3, rout: 1e5, cap: 1e-12, inverting: true },
      ],
      millers: [{ from: 'a', to: 'b', cc: 1e-12, rz: 500 }],
      buffered: [{ from: 'b', to: 'a', cc: 1e-12, gm: 1e-4 }],
    });
    const r = buildNetwork(model);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.network.nodes.map((n) => n.name)).toEqual(['a', 'b', 'miller1.mid', 'buffer1.in']);
    expect(r.network.n).toBe(4);
    expect(r.network.capRank).toBe(4);
  });

  it('reports a floating node by name', () => {
    const model = buildModel({
      stages: [{ name: 'a', input: 'in', gm: 1e-4, rout: 1e6, cap: 1e-13 }],
      nodes: ['lost'],
      output: 'a',
    });
    const a = analyzeDesign(model);
    expect(a.problems).toHaveLength(1);
    expect(a.problems[0].node).toBe('lost');
    expect(a.poles).toEqual([]);
  });
});

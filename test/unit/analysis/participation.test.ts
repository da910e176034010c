import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../../shared/src/analysis';
import type { Pole } from '../../../shared/src/analysis';
import { buildModel, twoStage } from './buildModel';

const base = { gm1: 100e-6, r1: 2e6, c1: 100e-15, gm2: 2e-3, r2: 100e3, c2: 2e-12, cc: 1e-12 };
const sum = (p: readonly { share: number }[]) => p.reduce((acc, x) => acc + x.share, 0);
const shareOf = (p: Pole, node: string) => p.participation.find((x) => x.node === node)?.share ?? 0;

describe('participation as shown', () => {
  it('without a nulling resistor: design nodes only, no raw list, dominant pole named after the first stage', () => {
    const a = analyzeDesign(twoStage(base));
    for (const p of a.poles) {
      expect(p.rawParticipation).toBeUndefined();
      expect(p.participation.map((x) => x.node).sort()).toEqual(['a', 'b']);
      expect(sum(p.participation)).toBeCloseTo(1, 12);
    }
    // Miller splitting: the dominant pole sits on the high-impedance first-stage node (GHLM ch. 9, from
    // memory).
    expect(a.poles[0].namedAfter).toBe('a');
  });

  it('with a small nulling resistor the junction counts with the first stage; the raw shares keep the junction', () => {
    const a = analyzeDesign(twoStage({ ...base, rz: 1000 }));
    expect(a.problems).toEqual([]);
    const p1 = a.poles[0];
    // The Miller capacitor's charge sits on the Rz–Cc junction (raw), which at the dominant pole moves
    // with node a: Rz = 1 kΩ against |Z_a| of megaohms.
    expect(p1.rawParticipation?.[0].node).toBe('miller1.mid');
    expect(p1.rawParticipation![0].share).toBeGreaterThan(0.9);
    expect(p1.namedAfter).toBe('a');
    expect(p1.participation[0]).toEqual({ node: 'a', share: expect.any(Number) });
    expect(p1.participation[0].share).toBeGreaterThan(0.99);
    expect(p1.participation.some((x) => x.node.includes('junction'))).toBe(false);
    for (const p of a.poles) {
      expect(sum(p.participation)).toBeCloseTo(1, 12);
      expect(sum(p.rawParticipation!)).toBeCloseTo(1, 12);
      expect(['a', 'b', 'shared']).toContain(p.namedAfter);
      expect(p.participation.some((x) => x.node === 'miller1.mid')).toBe(false);
    }
    // The third pole, about 1/(Rz·C1) (common practice), is where the resistor carries the mode's
    // voltage: the junction is not joined and appears under its label.
    const p3 = a.poles[2];
    expect(shareOf(p3, 'miller a -> b (Rz–Cc junction)')).toBeGreaterThan(0);
  });

  it('an internal node that holds the pole does not name it', () => {
    // A large Rz (comparable to R1): the junction is its own node at the third pole.
    const a = analyzeDesign(twoStage({ ...base, rz: 1e7 }));
    expect(a.problems).toEqual([]);
    for (const p of a.poles) {
      expect(['a', 'b', 'shared']).toContain(p.namedAfter);
      expect(sum(p.participation)).toBeCloseTo(1, 12);
      const junction = shareOf(p, 'miller a -> b (Rz–Cc junction)');
      if (junction >= 0.8) expect(p.namedAfter).toBe('shared');
    }
  });

  it('an indirect (buffered) capacitor: the buffer input counts with the node it feeds at the dominant pole', () => {
    const model = buildModel({
      stages: [
        { name: 'a', input: 'in', gm: 1e-4, rout: 1e6, cap: 1e-13 },
        { name: 'b', input: 'a', gm: 1e-3, rout: 1e5, cap: 1e-12, inverting: true },
      ],
      buffered: [{ from: 'b', to: 'a', cc: 1e-12, gm: 5e-5, cap: 2e-14 }],
    });
    const a = analyzeDesign(model);
    expect(a.problems).toEqual([]);
    expect(a.poles).toHaveLength(3);
    for (const p of a.poles) {
      expect(p.participation.some((x) => x.node === 'buffer1.in')).toBe(false);
      expect(p.rawParticipation!.some((x) => x.node === 'buffer1.in')).toBe(true);
      expect(sum(p.participation)).toBeCloseTo(1, 12);
      expect(sum(p.rawParticipation!)).toBeCloseTo(1, 12);
      expect(['a', 'b', 'shared']).toContain(p.namedAfter);
    }
    // The compensation charge sits on the buffer input (raw), but at the dominant pole the common-gate
    // buffer (1/gm = 20 kΩ against R1 = 1 MΩ) passes an injected current on into a: the pole is a's.
    const p1 = a.poles[0];
    expect(p1.rawParticipation![0].node).toBe('buffer1.in');
    expect(p1.namedAfter).toBe('a');
    expect(shareOf(p1, 'a')).toBeGreaterThan(0.9);
    // Where the buffer input keeps a share, it is listed under its statement's label.
    const kept = a.poles.flatMap((p) => p.participation).filter((x) => x.node.startsWith('indirect'));
    for (const x of kept) expect(x.node).toBe('indirect b -> a (buffer input)');
  });
});

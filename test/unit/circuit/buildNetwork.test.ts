// The stamps of each model item, written out by hand from Kirchhoff's current law (current leaving a
// node is positive; a non-inverting gm injects into its node).
import { describe, expect, it } from 'vitest';
import { buildNetwork, type Network } from '../../../shared/src/analysis';
import { buildModel } from '../analysis/buildModel';

function net(spec: Parameters<typeof buildModel>[0]): Network {
  const r = buildNetwork(buildModel(spec));
  if (!r.ok) throw new Error(r.problems.map((p) => p.message).join('; '));
  return r.network;
}
const at = (m: Float64Array, n: number, i: number, j: number) => m[i * n + j];

describe('buildNetwork stamps', () => {
  it('stage polarity: non-inverting injects (G[k][c] = −gm), inverting draws out (+gm)', () => {
    const n = net({
      stages: [
        { name: 'a', input: 'in', gm: 2e-4, rout: 1e5, cap: 1e-13 },
        { name: 'b', input: 'a', gm: 3e-3, rout: 2e4, cap: 2e-12, inverting: true },
      ],
    });
    expect(n.nodes.map((x) => x.name)).toEqual(['a', 'b']);
    expect(Array.from(n.gIn)).toEqual([-2e-4, 0]);
    expect(at(n.G, 2, 0, 0)).toBeCloseTo(1e-5, 18);
    expect(at(n.G, 2, 1, 0)).toBe(3e-3);
    expect(at(n.G, 2, 1, 1)).toBeCloseTo(5e-5, 18);
    expect(at(n.C, 2, 0, 0)).toBe(1e-13);
    expect(at(n.C, 2, 1, 1)).toBe(2e-12);
    expect(n.output).toBe(1);
  });

  it('a Miller capacitor with a nulling resistor goes through an internal midpoint', () => {
    const n = net({
      stages: [
        { name: 'a', input: 'in', gm: 1e-4, rout: 1e6 },
        { name: 'b', input: 'a', gm: 1e-3, rout: 1e5, inverting: true },
      ],
      millers: [{ from: 'a', to: 'b', cc: 1e-12, rz: 1e3 }],
    });
    expect(n.nodes[2]).toEqual({
      name: 'miller1.mid',
      kind: 'internal',
      label: 'miller a -> b (Rz–Cc junction)',
      seriesTo: 0,
    });
    // 1/rz between a and the midpoint; cc between the midpoint and b.
    expect(at(n.G, 3, 0, 2)).toBe(-1e-3);
    expect(at(n.G, 3, 2, 2)).toBe(1e-3);
    expect(at(n.C, 3, 2, 1)).toBe(-1e-12);
    expect(at(n.C, 3, 2, 2)).toBe(1e-12);
    expect(at(n.C, 3, 0, 0)).toBe(0);
    expect(n.capRank).toBe(1);
  });

  it('a buffered capacitor: cc into the buffer input, 1/gm to ground there, gm·v(input) injected into `to`', () => {
    const n = net({
      stages: [
        { name: 'a', input: 'in', gm: 1e-4, rout: 1e6, cap: 1e-13 },
        { name: 'b', input: 'a', gm: 1e-3, rout: 1e5, cap: 1e-12, inverting: true },
      ],
      buffered: [{ from: 'b', to: 'a', cc: 1e-12, gm: 5e-5, cap: 2e-14 }],
    });
    expect(n.nodes[2]).toEqual({
      name: 'buffer1.in',
      kind: 'internal',
      label: 'indirect b -> a (buffer input)',
      currentTo: 0,
    });
    expect(at(n.G, 3, 2, 2)).toBe(5e-5);
    expect(at(n.G, 3, 0, 2)).toBe(-5e-5);
    expect(at(n.C, 3, 1, 2)).toBe(-1e-12);
    expect(at(n.C, 3, 2, 2)).toBeCloseTo(1.02e-12, 26);
  });

  it('elements may touch ground and the input; a capacitor to the input fills cIn', () => {
    const n = net({
      stages: [],
      nodes: ['x'],
      output: 'x',
      elements: [
        { kind: 'res', a: 'in', b: 'x', value: 1e3 },
        { kind: 'cap', a: 'x', b: 'in', value: 1e-12 },
        { kind: 'gm', control: 'x', output: 'gnd', value: 1 },
      ],
    });
    expect(Array.from(n.gIn)).toEqual([-1e-3]);
    expect(Array.from(n.cIn)).toEqual([-1e-12]);
    expect(Array.from(n.G)).toEqual([1e-3]);
    expect(n.capRank).toBe(1);
  });

  it('capRank: nodes joined only by capacitors among themselves lose one rank per group', () => {
    const n = net({
      stages: [
        { name: 'a', input: 'in', gm: 1e-4, rout: 1e5 },
        { name: 'b', input: 'a', gm: 1e-4, rout: 1e5 },
        { name: 'c', input: 'b', gm: 1e-4, rout: 1e5 },
      ],
      elements: [
        { kind: 'cap', a: 'a', b: 'b', value: 1e-12 },
        { kind: 'cap', a: 'b', b: 'c', value: 1e-12 },
      ],
    });
    expect(n.capRank).toBe(2);
  });

  it('names every problem it finds', () => {
    const r = buildNetwork(
      buildModel({
        stages: [{ name: 'a', input: 'nowhere', gm: 1e-4, rout: 0 }],
      }),
    );
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems.map((p) => p.message)).toEqual([
      "stage a refers to node 'nowhere', which is not declared",
    ]);
    const z = buildNetwork(buildModel({ stages: [{ name: 'a', input: 'in', gm: 1e-4, rout: 0 }] }));
    expect(!z.ok && z.problems[0].message).toMatch(/rout is zero/);
  });
});

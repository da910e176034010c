// Random linear networks of R, C and gm for property tests against outside references.
import fc from 'fast-check';
import type { DesignModel } from '../../../shared/src/language/model';
import { buildModel, type ElementSpec } from './buildModel';

export interface RandomNetworkSpec {
  n: number;
  /** Every node has a capacitor to ground, so C is invertible. */
  groundCaps: number[];
  groundRes: number[];
  couplings: { a: number; b: number; kind: 'res' | 'cap'; value: number }[];
  gms: { control: number; output: number; value: number; inverting: boolean }[];
  inputNode: number;
  inputGm: number;
  output: number;
}

const logUniform = (lo: number, hi: number) =>
  fc.double({ min: Math.log10(lo), max: Math.log10(hi), noNaN: true }).map((e) => 10 ** e);

/** Networks of 2–7 nodes with values spread over `decades` around typical on-chip magnitudes. */
export function randomNetworkSpec(maxNodes = 7, decades = 3): fc.Arbitrary<RandomNetworkSpec> {
  return fc.integer({ min: 2, max: maxNodes }).chain((n) =>
    fc.record({
      n: fc.constant(n),
      groundCaps: fc.array(logUniform(1e-14 / 10 ** (decades / 2), 1e-14 * 10 ** (decades / 2)), {
        minLength: n,
        maxLength: n,
      }),
      groundRes: fc.array(logUniform(1e4 / 10 ** (decades / 2), 1e4 * 10 ** (decades / 2)), {
        minLength: n,
        maxLength: n,
      }),
      couplings: fc.array(
        fc.record({
          a: fc.integer({ min: 0, max: n - 1 }),
          b: fc.integer({ min: 0, max: n - 1 }),
          kind: fc.constantFrom<'res' | 'cap'>('res', 'cap'),
          value: logUniform(1e-3, 1e3),
        }),
        { maxLength: n + 2 },
      ),
      gms: fc.array(
        fc.record({
          control: fc.integer({ min: 0, max: n - 1 }),
          output: fc.integer({ min: 0, max: n - 1 }),
          value: logUniform(1e-6, 1e-3),
          inverting: fc.boolean(),
        }),
        { maxLength: n + 1 },
      ),
      inputNode: fc.integer({ min: 0, max: n - 1 }),
      inputGm: logUniform(1e-6, 1e-3),
      output: fc.integer({ min: 0, max: n - 1 }),
    }),
  );
}

/** A coupling value v is scaled: resistors v·10 kΩ, capacitors v·10 fF. */
export function modelOf(spec: RandomNetworkSpec): DesignModel {
  const name = (i: number) => `n${i}`;
  const elements: ElementSpec[] = [];
  for (let i = 0; i < spec.n; i++) {
    elements.push({ kind: 'cap', a: name(i), b: 'gnd', value: spec.groundCaps[i] });
    elements.push({ kind: 'res', a: name(i), b: 'gnd', value: spec.groundRes[i] });
  }
  for (const c of spec.couplings) {
    if (c.a === c.b) continue;
    elements.push({
      kind: c.kind,
      a: name(c.a),
      b: name(c.b),
      value: c.kind === 'res' ? c.value * 1e4 : c.value * 1e-14,
    });
  }
  for (const g of spec.gms) {
    elements.push({
      kind: 'gm',
      control: name(g.control),
      output: name(g.output),
      value: g.value,
      inverting: g.inverting,
    });
  }
  elements.push({ kind: 'gm', control: 'in', output: name(spec.inputNode), value: spec.inputGm });
  return buildModel({
    stages: [],
    nodes: Array.from({ length: spec.n }, (_, i) => name(i)),
    output: name(spec.output),
    elements,
  });
}

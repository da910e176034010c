// The engine against general-purpose numerical libraries on random networks.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { EigenvalueDecomposition, Matrix, inverse } from 'ml-matrix';
import { all, create, type Complex as MathComplex, type Matrix as MathMatrix } from 'mathjs';
import {
  analyzeDesign,
  buildNetwork,
  openLoopResponse,
  openLoopResponsePz,
} from '../../../shared/src/analysis';
import type { Network } from '../../../shared/src/analysis';
import { poleResidual } from '../../../shared/src/analysis/rootCheck';
import { modelOf, randomNetworkSpec } from './randomNetworks';
import { worstMatch } from './buildModel';

// No tolerance-based rounding to zero: the references must see values far below the matrix norm.
const math = create(all, { relTol: 1e-300, absTol: 0 });

const asMatrix = (a: Float64Array, n: number) =>
  new Matrix(Array.from({ length: n }, (_, i) => Array.from(a.subarray(i * n, i * n + n))));

function network(model: ReturnType<typeof modelOf>): Network {
  const b = buildNetwork(model);
  if (!b.ok) throw new Error(b.problems[0].message);
  return b.network;
}

describe('poles against ml-matrix', () => {
  it('equal the eigenvalues of −C⁻¹G (ml-matrix EigenvalueDecomposition) where C is invertible', () => {
    fc.assert(
      fc.property(randomNetworkSpec(7, 4), (spec) => {
        const model = modelOf(spec);
        const net = network(model);
        // A pole set by a near-cancellation in G (1/R against a positive-feedback gm, to 1 part in 10⁶ or
        // worse) is fixed by the rounding of the inputs, not by the method; such draws are compared in
        // the exact-arithmetic test below instead.
        fc.pre(poleResidual(net, { re: 0, im: 0 }) > 1e-6);
        const a = analyzeDesign(model, { step: false });
        expect(a.problems).toEqual([]);
        const M = inverse(asMatrix(net.C, net.n)).mmul(asMatrix(net.G, net.n)).mul(-1);
        const e = new EigenvalueDecomposition(M);
        const ref = e.realEigenvalues.map((re, i) => ({ re, im: e.imaginaryEigenvalues[i] }));
        expect(a.poles).toHaveLength(net.n);
        expect(
          worstMatch(
            a.poles.map((p) => p.s),
            ref,
          ),
        ).toBeLessThan(1e-7);
      }),
      { numRuns: 200, seed: 1 },
    );
  });
});

describe('a pole set by a near-cancellation', () => {
  it('matches the root of det(G + sC) found in exact rational arithmetic', () => {
    const model = modelOf({
      n: 3,
      groundCaps: [1e-12, 1e-12, 1e-12],
      groundRes: [999998.7627874309, 4377.245192006326, 100],
      couplings: [{ a: 1, b: 0, kind: 'cap', value: 1 }],
      gms: [
        { control: 1, output: 0, value: 0.001, inverting: false },
        { control: 0, output: 0, value: 0.0000010000037571647593, inverting: false },
      ],
      inputNode: 0,
      inputGm: 0.001,
      output: 0,
    });
    const a = analyzeDesign(model, { step: false });
    // det(G + sC) of these double values bisected with Python's fractions.Fraction (exact rationals) to
    // 80 halvings: 2.6080302338861583 rad/s (a right-half-plane pole).
    const slow = a.poles[0].s.re;
    expect(Math.abs(slow - 2.6080302338861583) / 2.6080302338861583).toBeLessThan(1e-12);
  });
});

describe('frequency response against mathjs', () => {
  it('the direct solve equals a mathjs complex LU solve of (G + jωC)v = −(gIn + jωcIn)', () => {
    fc.assert(
      fc.property(randomNetworkSpec(6, 3), fc.double({ min: 3, max: 11, noNaN: true }), (spec, logW) => {
        const model = modelOf(spec);
        const net = network(model);
        const w = 10 ** logW;
        const n = net.n;
        const A = math.matrix(
          Array.from({ length: n }, (_, i) =>
            Array.from({ length: n }, (_, j) => math.complex(net.G[i * n + j], w * net.C[i * n + j])),
          ),
        );
        const b = Array.from({ length: n }, (_, i) => [math.complex(-net.gIn[i], -w * net.cIn[i])]);
        const x = math.lusolve(A, b) as MathMatrix;
        const ref = math.complex(x.get([net.output, 0]) as MathComplex);
        // Compare complex values relative to the size of the whole solution vector (a transfer that
        // vanishes by structure is zero in one solve and roundoff in the other).
        let size = 0;
        for (let i = 0; i < n; i++)
          size = Math.max(size, math.abs(x.get([i, 0]) as MathComplex) as unknown as number);
        const ours = openLoopResponse(net, [w / (2 * Math.PI)]);
        const mag = 10 ** (ours.magDb[0] / 20);
        const ph = (ours.phaseDeg[0] * Math.PI) / 180;
        const err = Math.hypot(mag * Math.cos(ph) - ref.re, mag * Math.sin(ph) - ref.im);
        expect(err).toBeLessThan(1e-10 * size + 1e-300);
      }),
      { numRuns: 150, seed: 2 },
    );
  });

  it('the direct solve equals gain·Π(jω − z)/Π(jω − p) at many frequencies, phase unwrapped alike', () => {
    fc.assert(
      fc.property(randomNetworkSpec(7, 4), (spec) => {
        const model = modelOf(spec);
        const a = analyzeDesign(model, { step: false });
        // A network whose output does not depend on the input has no finite response to compare.
        fc.pre(a.dcGain !== 0 || a.zeros.length > 0);
        const mags = [...a.poles, ...a.zeros].map((r) => Math.hypot(r.s.re, r.s.im)).filter((m) => m > 0);
        const lo = Math.min(...mags) / 100;
        const hi = Math.max(...mags) * 100;
        const hz = Array.from({ length: 60 }, (_, i) => (lo * (hi / lo) ** (i / 59)) / (2 * Math.PI));
        const direct = openLoopResponse(model, hz);
        const pz = openLoopResponsePz(model, hz);
        for (let i = 0; i < hz.length; i++) {
          // Relative agreement of |H| (1e-6 in dB terms is 1e-7 relative) and of the unwrapped phase.
          expect(Math.abs(direct.magDb[i] - pz.magDb[i])).toBeLessThan(1e-5);
          expect(Math.abs(direct.phaseDeg[i] - pz.phaseDeg[i])).toBeLessThan(1e-4);
        }
      }),
      { numRuns: 150, seed: 3 },
    );
  });
});

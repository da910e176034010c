// Every example file, parsed and analysed in every corner, checked against outside references.
import { describe, expect, it } from 'vitest';
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { EigenvalueDecomposition, Matrix, inverse } from 'ml-matrix';
import { parseDocument } from '../../../shared/src/language';
import {
  analyzeCorners,
  buildNetwork,
  classicTwoStage,
  openLoopResponse,
  openLoopResponsePz,
} from '../../../shared/src/analysis';
import { symmetricEigen } from '../../../shared/src/numeric/symmetricEigen';
import { buildLoopNetwork } from '../../../shared/src/analysis/loopCore';
import { heldCharges } from '../../../shared/src/analysis/heldCharge';
import { quadraticRoots, relErr } from './buildModel';

const dir = join(__dirname, '../../../examples');
const files = readdirSync(dir).filter((f) => f.endsWith('.ampnote'));

describe.each(files)('example %s', (file) => {
  const parsed = parseDocument(readFileSync(join(dir, file), 'utf8'));

  it('parses into at least one design with a nominal model', () => {
    expect(parsed.designs.length).toBeGreaterThan(0);
    for (const d of parsed.designs) expect(d.nominal).toBeDefined();
  });

  for (const design of parsed.designs) {
    const { runs, worst } = analyzeCorners(design);

    it(`${design.name}: every corner analyses, with pole count = rank of C and roots that pass the network check`, () => {
      expect(runs.length).toBe(1 + design.corners.filter((c) => c.model).length);
      expect(runs[0].corner).toBe('nominal');
      for (const run of runs) {
        expect(run.analysis.problems).toEqual([]);
        // The loop's own network: the amplifier for `feedback beta`, the loop broken at its node for
        // `feedback at`. A held charge's pole at the origin cancels in the loop's transfer.
        const built = buildLoopNetwork(run.model);
        if (!built.ok) throw new Error('network');
        expect(run.analysis.poles).toHaveLength(built.network.capRank - heldCharges(built.network));
        for (const p of run.analysis.poles) expect(p.residual!).toBeLessThan(1e-8);
        for (const z of run.analysis.zeros) expect(z.residual!).toBeLessThan(1e-8);
        expect(run.analysis.warnings).toBeUndefined();
      }
      if (worst.phaseMarginDeg) {
        const pms = runs.map((r) => r.analysis.loop.phaseMarginDeg ?? Infinity);
        expect(worst.phaseMarginDeg.value).toBe(Math.min(...pms));
        expect(runs[pms.indexOf(worst.phaseMarginDeg.value)].corner).toBe(worst.phaseMarginDeg.corner);
      }
    });

    it(`${design.name}: poles agree with ml-matrix eigenvalues of −C⁻¹G where C is invertible`, () => {
      // Every natural frequency of a network, from ml-matrix (undefined when C is singular).
      const reference = (net: { n: number; C: Float64Array; G: Float64Array }) => {
        const n = net.n;
        const eig = symmetricEigen(net.C, n);
        if (!(eig.values[n - 1] > 1e-9 * eig.values[0])) return undefined;
        const m = (a: Float64Array) =>
          new Matrix(Array.from({ length: n }, (_, i) => Array.from(a.subarray(i * n, i * n + n))));
        const e = new EigenvalueDecomposition(inverse(m(net.C)).mmul(m(net.G)).mul(-1));
        return e.realEigenvalues.map((re, i) => ({ re, im: e.imaginaryEigenvalues[i] }));
      };
      const near = (p: { re: number; im: number }, ref: { re: number; im: number }[]) =>
        Math.min(...ref.map((q) => Math.hypot(p.re - q.re, p.im - q.im) / Math.hypot(q.re, q.im)));
      for (const run of runs) {
        const built = buildLoopNetwork(run.model);
        if (!built.ok) throw new Error('network');
        const ref = reference(built.network);
        if (ref) for (const p of run.analysis.poles) expect(near(p.s, ref)).toBeLessThan(1e-8);
        // A loop written as a circuit: its closed circuit's poles are the natural frequencies of the
        // network as written (a held charge's is exactly 0; ml-matrix gives it within roundoff).
        const circuit = run.analysis.closedCircuit;
        if (!circuit) continue;
        const closed = buildNetwork(run.model);
        if (!closed.ok) throw new Error('network');
        const refClosed = reference(closed.network);
        if (!refClosed) continue;
        let scale = 0;
        for (const q of refClosed) scale = Math.max(scale, Math.hypot(q.re, q.im));
        for (const p of circuit.poles) {
          if (p.s.re === 0 && p.s.im === 0)
            expect(Math.min(...refClosed.map((q) => Math.hypot(q.re, q.im)))).toBeLessThan(1e-9 * scale);
          else expect(near(p.s, refClosed)).toBeLessThan(1e-8);
        }
      }
    });

    it(`${design.name}: the direct response equals the pole/zero/gain form`, () => {
      for (const run of runs) {
        const hz = Array.from({ length: 50 }, (_, i) => 10 ** (i / 5));
        const a = openLoopResponse(run.model, hz);
        const b = openLoopResponsePz(run.model, hz);
        a.magDb.forEach((m, i) => expect(Math.abs(m - b.magDb[i])).toBeLessThan(1e-6));
        a.phaseDeg.forEach((p, i) => expect(Math.abs(p - b.phaseDeg[i])).toBeLessThan(1e-5));
      }
    });

    it(`${design.name}: a classic two-stage case matches the closed-form denominator`, () => {
      for (const run of runs) {
        const t = classicTwoStage(run.model);
        if (!t || t.rz > 0) continue;
        // D(s) of the two-stage Miller amplifier (GHLM ch. 9, from memory; re-derived).
        const b1 = (t.c1 + t.cc) * t.r1 + (t.c2 + t.cc) * t.r2 + t.gm2 * t.r1 * t.r2 * t.cc;
        const b2 = t.r1 * t.r2 * (t.c1 * t.c2 + t.cc * (t.c1 + t.c2));
        const want = quadraticRoots(b2, b1, 1);
        run.analysis.poles.forEach((p, i) => expect(relErr(p.s.re, want[i].re)).toBeLessThan(1e-9));
        expect(relErr(run.analysis.zeros[0].s.re, t.gm2 / t.cc)).toBeLessThan(1e-9);
      }
    });
  }
});

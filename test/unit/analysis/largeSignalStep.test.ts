// The large-signal step (analysis/largeSignalStep.ts) against sources outside it: the exact linear step
// for a step too small to leave any stage's linear range, a closed form for a single saturating stage, and
// an independent general-purpose integrator (the `odex` package, an extrapolation method) on a two-stage
// design written out by hand.
import { describe, expect, it } from 'vitest';
import { createRequire } from 'node:module';
import { analyzeDesign } from '../../../shared/src/analysis';
import { buildNetwork } from '../../../shared/src/circuit/buildNetwork';
import { analyzeCore } from '../../../shared/src/analysis/core';
import { largeSignalStep } from '../../../shared/src/analysis/largeSignalStep';
import { expm } from '../../../shared/src/numeric/expm';
import { RADAU_A, RADAU_C, radauStep } from '../../../shared/src/numeric/radau';
import { parseDocument } from '../../../shared/src/language';
import { measure } from '../../../shared/src/checks/measure';
import { requirementSlack } from '../../../shared/src/checks/requirementSlack';
import { DEFAULT_CHECK_SETTINGS } from '../../../shared/src/checks/settings';
import { solveDesign } from '../../../shared/src/solve/solveDesign';
import { brentRoot } from '../../../shared/src/numeric/roots';
import { analyzeDocument } from '../../../shared/src/service';
import type { DesignModel } from '../../../shared/src/language/model';

// The package ships its TypeScript source, which the project's strict type check would compile; loaded
// through require with the part of its interface used here.
interface OdexSolver {
  absoluteTolerance: number;
  relativeTolerance: number;
  denseOutput: boolean;
  maxSteps: number;
  solve(
    f: (x: number, y: number[]) => number[],
    x0: number,
    y0: number[],
    xEnd: number,
    out: unknown,
  ): unknown;
  grid(dt: number, out: (x: number, y: number[]) => void): unknown;
}
const { Solver } = createRequire(import.meta.url)('odex') as { Solver: new (n: number) => OdexSolver };

const modelOf = (text: string): DesignModel => {
  const doc = parseDocument(text);
  expect(doc.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
  return doc.designs[0]!.nominal!;
};
const relErr = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

const twoStage = (step: string, tol = '0.1 %') => `design sc
  stage first  gm = 200 uS rout = 5 Mohm cap = 50 fF bias = 10 uA
  stage second gm = 2 mS rout = 200 kohm cap = 100 fF bias = 100 uA inverting
  load cap = 2 pF
  miller first -> second cc = 1 pF
  require settle ${tol} within 1 us step ${step}
end
`;

describe('Radau IIA step', () => {
  it('has the (3,2) Padé approximant of e^z as its stability function', () => {
    // R(z) = (1 + 2z/5 + z²/20)/(1 − 3z/5 + 3z²/20 − z³/60) (Hairer & Wanner II, §IV.5 — from memory; it
    // is also the (3,2) entry of the Padé table of e^z, which the value at z = −0.1 checks).
    for (const z of [-0.1, -1, -10, -1000]) {
      const sys = {
        n: 1,
        M: Float64Array.of(1),
        f: (y: Float64Array, out: Float64Array) => void (out[0] = z * y[0]!),
        jacobian: (_: Float64Array, out: Float64Array) => void (out[0] = z),
      };
      const r = radauStep(sys, Float64Array.of(1), 1, Float64Array.of(1e-12), 1e-3)!;
      const pade = (1 + (2 * z) / 5 + (z * z) / 20) / (1 - (3 * z) / 5 + (3 * z * z) / 20 - (z * z * z) / 60);
      expect(Math.abs(r.y[0]! - pade)).toBeLessThan(1e-14 * Math.max(1, Math.abs(pade)));
    }
    expect(Math.abs(Math.exp(-0.1) - 0.9048374180359595)).toBeLessThan(1e-15);
    // Row sums of A equal the nodes c (the collocation conditions of order one).
    RADAU_A.forEach((row, i) => expect(Math.abs(row[0] + row[1] + row[2] - RADAU_C[i]!)).toBeLessThan(1e-15));
  });

  it('is of order 5 or more on y′ = −y² (solution 1/(1 + t)) with an algebraic companion z = y²', () => {
    // M = diag(1, 0): y′ = −z, 0 = y² − z, an index-1 system. The global error at t = 1 with N steps falls
    // by at least 2⁵ per halving of the step (order 2s − 1 = 5 at the grid points for both components).
    const sys = {
      n: 2,
      M: Float64Array.of(1, 0, 0, 0),
      f: (v: Float64Array, out: Float64Array) => {
        out[0] = -v[1]!;
        out[1] = v[0]! * v[0]! - v[1]!;
      },
      jacobian: (v: Float64Array, out: Float64Array) => out.set([0, -1, 2 * v[0]!, -1]),
    };
    const errorsWith = (steps: number) => {
      let y: Float64Array = Float64Array.of(1, 1);
      for (let k = 0; k < steps; k++)
        y = radauStep(sys, y, 1 / steps, Float64Array.of(1e-12, 1e-12), 1e-3)!.y;
      return [Math.abs(y[0]! - 0.5), Math.abs(y[1]! - 0.25)];
    };
    const [coarse, fine] = [errorsWith(2), errorsWith(4)];
    for (const k of [0, 1]) {
      expect(fine[k]).toBeGreaterThan(0);
      expect(coarse[k]! / fine[k]!).toBeGreaterThan(2 ** 5);
    }
  });
});

describe('large-signal step', () => {
  it('equals the exact linear step for a step no stage leaves its linear range for (1e-4 relative)', () => {
    const model = modelOf(twoStage('1 uV'));
    const a = analyzeDesign(model);
    const large = a.largeSignalStep!;
    expect(large).toBeDefined();
    // Reference: the closed loop's exact state-space step, x(t) = ∫₀ᵗ e^(Aτ)dτ·b, from the exponential of
    // the augmented matrix [[A, b], [0, 0]]·t (Van Loan's block form), scaled by the amplitude.
    const core = analyzeCore(
      (buildNetwork(model) as { ok: true; network: never }).network,
      model.feedback.kind === 'factor' ? model.feedback.beta : 1,
    );
    if (!core.ok) throw new Error('no core');
    const sys = core.result.closed;
    const n = sys.order;
    const exact = (t: number) => {
      const m = n + 1;
      const aug = new Float64Array(m * m);
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) aug[i * m + j] = sys.A[i * n + j]! * t;
        aug[i * m + n] = sys.b[i]! * t;
      }
      const e = expm(aug, m);
      let y = sys.d;
      for (let i = 0; i < n; i++) y += sys.c[i]! * e[i * m + n]!;
      return y * 1e-6;
    };
    const final = large.final;
    expect(relErr(final, a.step!.final * 1e-6)).toBeLessThan(1e-6);
    let worst = 0;
    large.samples.t.forEach((t, i) => (worst = Math.max(worst, Math.abs(large.samples.y[i]! - exact(t)))));
    expect(worst / Math.abs(final)).toBeLessThan(1e-4);
    expect(relErr(large.settlingTime!, a.step!.settlingTime!)).toBeLessThan(1e-4);
    expect(large.smallSignalSettlingTime).toBe(a.step!.settlingTime);
    expect(large.slewingTime).toBe(0);
    expect(large.limitingStage).toBeUndefined();
  });

  it('a single saturating stage follows its closed form: slewing, then the exponential tail', () => {
    // Unity feedback around one stage with C·v′ = I·tanh(k·(A − v)), k = gm/I (rout so large that v/rout
    // is negligible: at most 1e-13 A against the 1e-8 A the stage still delivers at the band's edge). With
    // e = A − v the equation separates: ∫ coth(k·e) de = (1/k)·ln sinh(k·e) = −(I/C)·t + const, so
    //     sinh(k·e(t)) = sinh(k·A)·e^(−t/τ),  τ = C/gm,
    // and e falls to tol·A at t_s = τ·ln(sinh(k·A)/sinh(k·tol·A)). For k·A ≫ 1 this is A/SR − τ·ln 2 (the
    // slewing, SR = I/C) plus τ·ln(1/sinh(k·tol·A)) (the linear tail), the hand estimate's two parts.
    const [gm, I, C, A, tol] = [100e-6, 1e-6, 1e-12, 0.1, 1e-3];
    const model = modelOf(`design single
  stage s gm = 100 uS rout = 1 Tohm cap = 1 pF bias = 1 uA
  require settle 0.1 % within 1 us step 100 mV
end
`);
    const large = analyzeDesign(model).largeSignalStep!;
    const k = gm / I;
    const tau = C / gm;
    const ts = tau * Math.log(Math.sinh(k * A) / Math.sinh(k * tol * A));
    expect(relErr(large.settlingTime!, ts)).toBeLessThan(1e-3);
    // The waveform itself: v(t) = A − asinh(sinh(kA)·e^(−t/τ))/k.
    large.samples.t.forEach((t, i) => {
      const v = A - Math.asinh(Math.sinh(k * A) * Math.exp(-t / tau)) / k;
      expect(Math.abs(large.samples.y[i]! - v)).toBeLessThan(1e-6 * A);
    });
    // Slewing (I·tanh > 0.9·I) lasts while k·e > atanh(0.9): t = τ·ln(sinh(kA)/sinh(atanh 0.9)).
    const slewEnd = tau * Math.log(Math.sinh(k * A) / Math.sinh(Math.atanh(0.9)));
    expect(relErr(large.slewingTime, slewEnd)).toBeLessThan(1e-3);
    expect(large.limitingStage).toBe('s');
    // The largest slope is at t = 0: I·tanh(kA)/C.
    expect(relErr(large.slewRateReached, (I * Math.tanh(k * A)) / C)).toBeLessThan(1e-3);
    expect(large.overshootPct).toBe(0);
  });

  it('a two-stage design agrees with an independent integrator (odex) within 0.5 % on settling time', () => {
    const A = 1;
    const model = modelOf(twoStage('1 V'));
    const large = analyzeDesign(model).largeSignalStep!;
    expect(large.slewingTime).toBeGreaterThan(0);
    // The same circuit written out by hand (Kirchhoff's current law at both nodes, current leaving), with
    // the loop closed as u = A − β·σ·v2, β = 1, σ = −1 (the second stage inverts): u = A + v2.
    const [gm1, r1, c1, i1] = [200e-6, 5e6, 50e-15, 10e-6];
    const [gm2, r2, c2, i2] = [2e-3, 200e3, 100e-15 + 2e-12, 100e-6];
    const cc = 1e-12;
    // [c1 + cc, −cc; −cc, c2 + cc]·[v1′; v2′] = [i1·tanh(gm1·u/i1) − v1/r1; −i2·tanh(gm2·v1/i2) − v2/r2]
    const det = (c1 + cc) * (c2 + cc) - cc * cc;
    const f = (_: number, [v1, v2]: number[]) => {
      const u = A + v2!;
      const a = i1 * Math.tanh((gm1 * u) / i1) - v1! / r1;
      const b = -i2 * Math.tanh((gm2 * v1!) / i2) - v2! / r2;
      return [((c2 + cc) * a + cc * b) / det, (cc * a + (c1 + cc) * b) / det];
    };
    const solver = new Solver(2);
    solver.absoluteTolerance = 1e-12;
    solver.relativeTolerance = 1e-12;
    solver.denseOutput = true;
    solver.maxSteps = 1e6;
    const tEnd = 3e-6;
    const grid = 30000;
    const ts: number[] = [];
    const ys: number[] = [];
    solver.solve(
      f,
      0,
      [0, 0],
      tEnd,
      solver.grid(tEnd / grid, (t: number, y: number[]) => {
        ts.push(t);
        ys.push(-y[1]!); // σ·v2
      }),
    );
    const final = ys[ys.length - 1]!;
    expect(relErr(large.final, final)).toBeLessThan(1e-6);
    const band = 1e-3 * Math.abs(final);
    let last = 0;
    ys.forEach((y, i) => {
      if (Math.abs(y - final) > band) last = i;
    });
    // Linear interpolation between the grid points either side of the last exit from the band.
    const e0 = Math.abs(ys[last]! - final) - band;
    const e1 = Math.abs(ys[last + 1]! - final) - band;
    const reference = ts[last]! + ((ts[last + 1]! - ts[last]!) * e0) / (e0 - e1);
    expect(relErr(large.settlingTime!, reference)).toBeLessThan(0.005);
  });

  it('is what the settle requirement is judged by: its hover text and the slack of the solve', () => {
    const model = modelOf(twoStage('1 V'));
    const a = analyzeDesign(model);
    const large = a.largeSignalStep!;
    const req = model.requirements.find((r) => r.kind === 'settle')!;
    // The slack is the log ratio of the required time over the large-signal settling time (≥ 0 when met).
    expect(requirementSlack(req, a)).toBeCloseTo(Math.log(1e-6 / large.settlingTime!), 12);
    expect(large.settlingTime!).toBeGreaterThan(2 * large.smallSignalSettlingTime!);
    const m = measure(req, a);
    expect(m.label).toBe('settling of a 1 V step to ±0.1 %');
    // The first stage's 10 uA charges the 1 pF Miller capacitor (docs/analysis.md, Slew rate).
    expect(m.measured).toMatch(/^[\d.]+ ns \(slewing [\d.]+ ns\)$/);
    expect(m.detail).toMatch(
      /^slewing [\d.]+ ns of [\d.]+ ns; the first stage limits: 10 uA into 1 pF; small-signal settling alone: [\d.]+ ns$/,
    );
    expect(m.pass).toBe(true);
  });

  it('a loop closed by the circuit itself gives the same step as the same loop closed by a factor', () => {
    // The follower of the two-stage design written as a circuit: the first stage senses in − second
    // (inverting, so that the loop is negative: v2 = A1·A2·(vin − v2)). Mirroring both node voltages maps
    // it onto the factor form (u = A + v2, output −v2), so the two responses are the same function of time.
    const circuit = modelOf(`design follower
  stage first  from in, second gm = 200 uS rout = 5 Mohm cap = 50 fF bias = 10 uA inverting
  stage second gm = 2 mS rout = 200 kohm cap = 100 fF bias = 100 uA inverting
  load cap = 2 pF
  miller first -> second cc = 1 pF
  feedback at second
  require settle 0.1 % within 1 us step 1 V
end
`);
    const a = analyzeDesign(circuit).largeSignalStep!;
    const b = analyzeDesign(modelOf(twoStage('1 V'))).largeSignalStep!;
    expect(relErr(a.final, b.final)).toBeLessThan(1e-9);
    expect(relErr(a.settlingTime!, b.settlingTime!)).toBeLessThan(1e-4);
    expect(relErr(a.slewingTime, b.slewingTime)).toBeLessThan(1e-3);
    expect(a.limitingStage).toBe('first');
  });

  it('is a constraint of the solve: the least first-stage current that settles the step in time', () => {
    const design = (id1: string) => `design driver
  param id1 = ${id1} free 2 uA .. 100 uA
  stage first  gm = 15 /V * id1 rout = 4 Mohm cap = 60 fF bias = id1
  stage second gm = 3 mS rout = 150 kohm cap = 150 fF bias = 200 uA inverting
  load cap = 3 pF
  miller first -> second cc = 1.2 pF rz = 400 ohm
  require settle 0.1 % within 100 ns step 1 V
end
`;
    const result = solveDesign(parseDocument(design('20 uA')).designs[0]!, {
      settings: DEFAULT_CHECK_SETTINGS,
    });
    expect(result.status).toBe('met');
    const id1 = result.values.find((v) => v.name === 'id1')!.after;
    // Reference: the current at which the large-signal settling time equals 100 ns, by Brent's method on
    // the analysis itself (the settling time falls as the first stage's current, and so its slew rate, grows).
    const excess = (i: number) =>
      analyzeDesign(modelOf(design(`${i * 1e6} uA`))).largeSignalStep!.settlingTime! - 100e-9;
    const least = brentRoot(excess, 5e-6, 50e-6, excess(5e-6), excess(50e-6), 1e-10);
    // The solve rounds to 3 significant figures inwards (never below the boundary), and its search ends
    // within a step of about 1 % of it.
    expect(id1).toBeGreaterThanOrEqual(least * (1 - 1e-6));
    expect(id1 / least).toBeLessThan(1.02);
    expect(result.binding.join(' ')).toMatch(/settling of a 1 V step/);
  });

  it('the settle check judges each settle requirement on its own response, and names what limits the step', () => {
    const design = (small: string, large: string) => `design both
  stage first  gm = 300 uS rout = 4 Mohm cap = 60 fF bias = 20 uA
  stage second gm = 3 mS rout = 150 kohm cap = 150 fF bias = 200 uA inverting
  load cap = 3 pF
  miller first -> second cc = 1.2 pF rz = 400 ohm
  require settle 0.1 % within ${small}
  require settle 0.1 % within ${large} step 1 V
end
`;
    const settling = (text: string) => analyzeDocument(text).findings.filter((f) => f.code === 'settling');
    // The step slews at 20 uA / 1.2 pF = 16.7 V/us, so 1 V takes at least 60 ns; the small-signal
    // settling alone (closed-loop poles near 75 MHz) is about 20 ns.
    const onlyLarge = settling(design('1 us', '50 ns'));
    expect(onlyLarge).toHaveLength(1);
    expect(onlyLarge[0]!.message).toMatch(
      /^Settling a 1 V step to ±0\.1 % takes [\d.]+ ns, longer than the required 50 ns: slewing [\d.]+ ns of [\d.]+ ns; the first stage limits: 20 uA into 1\.2 pF; small-signal settling alone: [\d.]+ ns$/,
    );
    expect(onlyLarge[0]!.related.map((r) => r.message)).toContain(
      'the bias of stage first limits the slewing',
    );
    const onlySmall = settling(design('5 ns', '1 us'));
    expect(onlySmall).toHaveLength(1);
    expect(onlySmall[0]!.message).toMatch(
      /^Settling to ±0\.1 % takes [\d.]+ ns, longer than the required 5 ns/,
    );
  });

  it('a step beyond the output range ends where the output stage runs out of current, and says so', () => {
    // Gain 10 (β = 0.1) and a 10 V step ask for 100 V; the inverting output stage can hold at most its bias
    // into its rout: 100 uA · 200 kohm = 20 V (Ohm's law), where its tanh is within 1e-6 of 1.
    const model = modelOf(
      twoStage('10 V', '0.1 %').replace('require settle', 'feedback beta = 0.1\n  require settle'),
    );
    const a = analyzeDesign(model);
    const large = a.largeSignalStep!;
    expect(relErr(large.final, 100e-6 * 200e3)).toBeLessThan(1e-6);
    expect(large.saturatedStage).toBe('second');
    const req = model.requirements.find((r) => r.kind === 'settle')!;
    expect(measure(req, a).measured).toMatch(/\(beyond the output range\)$/);
    expect(measure(req, a).detail).toMatch(
      /the step is beyond the output's range: the second stage stays at its current limit and the output ends at 20 V/,
    );
  });
});

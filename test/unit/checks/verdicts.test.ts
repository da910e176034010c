// Verdicts a designer can trust: stability from the closed loop, phase margin in (−180°, 180°], several
// unity crossings read conservatively, no crossing from a DC gain of exactly 1, and fixes that solve their
// own rule. Reference values come from independent computations named beside each check.
import fc from 'fast-check';
import { EigenvalueDecomposition, Matrix, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { loopMetrics, frequencySpan, sampleLogGrid } from '../../../shared/src/analysis/loop';
import type { PoleZeroForm } from '../../../shared/src/analysis/frequency';
import { measure } from '../../../shared/src/checks/measure';
import type { Finding, TextEditSpec } from '../../../shared/src/checks/types';
import { parseDocument } from '../../../shared/src/language';
import { analyzeDocument } from '../../../shared/src/service';
import type { Requirement } from '../../../shared/src/language/model';

function apply(text: string, edits: readonly TextEditSpec[]): string {
  const lines = text.split('\n');
  const offset = (p: { line: number; character: number }) =>
    lines.slice(0, p.line).reduce((n, l) => n + l.length + 1, 0) + p.character;
  let out = text;
  for (const e of [...edits].sort((a, b) => offset(b.range.start) - offset(a.range.start)))
    out = out.slice(0, offset(e.range.start)) + e.newText + out.slice(offset(e.range.end));
  return out;
}

const codes = (fs: readonly Finding[]) => fs.map((f) => f.code);
const nominal = (text: string) => analyzeDocument(text).designs[0]!.runs[0]!.analysis;

interface StageSpec {
  gm: number;
  r: number;
  c: number;
  inverting: boolean;
}

/**
 * Closed-loop poles of a chain of stages with Miller capacitors, from nodal analysis written out by hand
 * (KCL at each stage node, the loop closed as v_in = −β·σ·v_out with σ the product of the polarities, the
 * sign that makes the DC loop gain negative feedback), as the eigenvalues of −C⁻¹G by ml-matrix.
 */
function referenceClosedPoles(
  stages: readonly StageSpec[],
  millers: readonly { from: number; to: number; cc: number }[],
  cl: number,
  beta = 1,
) {
  const n = stages.length;
  const G = Matrix.zeros(n, n);
  const C = Matrix.zeros(n, n);
  const sigma = stages.reduce((s, st) => s * (st.inverting ? -1 : 1), 1);
  stages.forEach((st, k) => {
    const pol = st.inverting ? -1 : 1;
    G.set(k, k, G.get(k, k) + 1 / st.r);
    C.set(k, k, C.get(k, k) + st.c);
    // Current injected into node k: pol·gm·v(input); as a current leaving the node, −pol·gm·v(input).
    if (k === 0) G.set(0, n - 1, G.get(0, n - 1) + pol * st.gm * beta * sigma);
    else G.set(k, k - 1, G.get(k, k - 1) - pol * st.gm);
  });
  C.set(n - 1, n - 1, C.get(n - 1, n - 1) + cl);
  for (const m of millers) {
    C.set(m.from, m.from, C.get(m.from, m.from) + m.cc);
    C.set(m.to, m.to, C.get(m.to, m.to) + m.cc);
    C.set(m.from, m.to, C.get(m.from, m.to) - m.cc);
    C.set(m.to, m.from, C.get(m.to, m.from) - m.cc);
  }
  const e = new EigenvalueDecomposition(inverse(C).mmul(G).mul(-1));
  return e.realEigenvalues.map((re, i) => ({ re, im: e.imaginaryEigenvalues[i]! }));
}

const NAMES = ['first', 'second', 'third'];
function designText(
  stages: readonly StageSpec[],
  millers: readonly { from: number; to: number; cc: number }[],
  cl: number,
): string {
  const lines = stages.map(
    (s, k) =>
      `  stage ${NAMES[k]} gm = ${s.gm} S  rout = ${s.r} ohm  cap = ${s.c} F${s.inverting ? '  inverting' : ''}`,
  );
  const caps = millers.map((m) => `  miller ${NAMES[m.from]} -> ${NAMES[m.to]} cc = ${m.cc} F`);
  return `design random\n${lines.join('\n')}\n  load cap = ${cl} F\n${caps.join('\n')}\nend\n`;
}

const POLARITY_SLIP = `design polarity_slip
  stage first   gm = 100 uS  rout = 1 Mohm    cap = 0.2 pF
  stage second  gm = 1 mS    rout = 100 kohm  cap = 0.2 pF
  load cap = 5 pF
  miller first -> second cc = 2 pF
  require pm >= 60 deg
end
`;

describe('stability from the closed loop', () => {
  it('an oscillating loop with a healthy-looking margin is an error', () => {
    const report = analyzeDocument(POLARITY_SLIP);
    const stability = report.findings.find((f) => f.code === 'stability')!;
    expect(stability.severity).toBe('error');
    expect(stability.message).toMatch(/right half-plane/);
    expect(stability.message).toMatch(/Bode plot do not decide/);
    const a = report.designs[0]!.runs[0]!.analysis;
    expect(a.stability?.verdict).toBe('unstable');
    expect(a.stability?.openLoopRhpPoles).toBe(2);
    // Reference: eigenvalues of the hand-written nodal matrices (ml-matrix): +11.9 MHz ± j8.5 MHz.
    const ref = referenceClosedPoles(
      [
        { gm: 100e-6, r: 1e6, c: 0.2e-12, inverting: false },
        { gm: 1e-3, r: 100e3, c: 0.2e-12, inverting: false },
      ],
      [{ from: 0, to: 1, cc: 2e-12 }],
      5e-12,
    );
    const upper = ref.filter((p) => p.im > 0)[0]!;
    const ours = a.stability!.verdict === 'stable' ? undefined : a.stability!.poles[0]!;
    expect(ours!.re).toBeCloseTo(upper.re, -3);
    expect(Math.abs(ours!.re / upper.re - 1)).toBeLessThan(1e-9);
    expect(Math.abs(ours!.im / upper.im - 1)).toBeLessThan(1e-9);
    expect(upper.re / (2 * Math.PI)).toBeCloseTo(11.9e6, -5);
    // Phase margin is an angle in (−180°, 180°], never 292°.
    expect(a.loop.phaseMarginDeg!).toBeGreaterThan(-180);
    expect(a.loop.phaseMarginDeg!).toBeLessThanOrEqual(180);
    // The fix flips the slipped stage, and the result is stable.
    const flip = stability.fixes.find((f) => f.title.includes('second inverting'))!;
    const fixed = analyzeDocument(apply(POLARITY_SLIP, flip.edits));
    expect(fixed.designs[0]!.runs[0]!.analysis.stability?.verdict).toBe('stable');
    expect(codes(fixed.findings)).not.toContain('stability');
  });

  it('the three-stage analogue is unstable too, and its margin stays in range', () => {
    const text = `design slip3
  stage first   gm = 50 uS   rout = 1 Mohm    cap = 50 fF
  stage second  gm = 200 uS  rout = 500 kohm  cap = 100 fF  inverting
  stage third   gm = 2 mS    rout = 50 kohm   cap = 300 fF
  load cap = 20 pF
  miller first  -> third  cc = 2.5 pF
  miller second -> third  cc = 4 pF
end
`;
    const a = nominal(text);
    const ref = referenceClosedPoles(
      [
        { gm: 50e-6, r: 1e6, c: 50e-15, inverting: false },
        { gm: 200e-6, r: 500e3, c: 100e-15, inverting: true },
        { gm: 2e-3, r: 50e3, c: 300e-15, inverting: false },
      ],
      [
        { from: 0, to: 2, cc: 2.5e-12 },
        { from: 1, to: 2, cc: 4e-12 },
      ],
      20e-12,
    );
    expect(ref.some((p) => p.re > 0)).toBe(true); // ml-matrix: a closed-loop pole in the right half-plane
    expect(a.stability?.verdict).toBe('unstable');
    expect(a.loop.phaseMarginDeg!).toBeLessThanOrEqual(180);
    expect(codes(analyzeDocument(text).findings)).toContain('stability');
  });

  it('agrees with an independent eigenvalue routine on random two- and three-stage designs of any polarity', () => {
    const stage = fc.record({
      gm: fc.double({ min: 1e-5, max: 5e-3, noNaN: true }),
      r: fc.double({ min: 2e4, max: 2e6, noNaN: true }),
      c: fc.double({ min: 2e-14, max: 1e-12, noNaN: true }),
      inverting: fc.boolean(),
    });
    const design = fc.oneof(
      fc.record({
        stages: fc.tuple(stage, stage),
        caps: fc.tuple(fc.double({ min: 1e-13, max: 1e-11, noNaN: true })),
        cl: fc.double({ min: 1e-13, max: 1e-10, noNaN: true }),
      }),
      fc.record({
        stages: fc.tuple(stage, stage, stage),
        caps: fc.tuple(
          fc.double({ min: 1e-13, max: 1e-11, noNaN: true }),
          fc.double({ min: 1e-13, max: 1e-11, noNaN: true }),
        ),
        cl: fc.double({ min: 1e-13, max: 1e-10, noNaN: true }),
      }),
    );
    let unstable = 0;
    let stable = 0;
    fc.assert(
      fc.property(design, ({ stages, caps, cl }) => {
        const millers =
          stages.length === 2
            ? [{ from: 0, to: 1, cc: caps[0]! }]
            : [
                { from: 0, to: 2, cc: caps[0]! },
                { from: 1, to: 2, cc: caps[1]! },
              ];
        const ref = referenceClosedPoles(stages, millers, cl);
        const scale = Math.max(...ref.map((p) => Math.hypot(p.re, p.im)));
        // A pole within rounding of the axis is a coin toss for both routines: not a fair test case.
        if (ref.some((p) => Math.abs(p.re) < 1e-7 * Math.max(Math.hypot(p.re, p.im), 1e-6 * scale))) return;
        const refUnstable = ref.some((p) => p.re > 0);
        const a = nominal(designText(stages, millers, cl));
        expect(a.stability?.verdict, designText(stages, millers, cl)).toBe(
          refUnstable ? 'unstable' : 'stable',
        );
        if (refUnstable) unstable++;
        else stable++;
      }),
      { numRuns: 150, seed: 20261202 },
    );
    // Both verdicts occur, so the property is not passing on one side only.
    expect(unstable).toBeGreaterThan(10);
    expect(stable).toBeGreaterThan(10);
  });
});

describe('several unity crossings', () => {
  // L(s) = k / (s·(s²/ω0² + 2ζs/ω0 + 1)): an integrator with a lightly damped resonance. With k = 0.1·ω0
  // and ζ = 0.04, |L| falls through 0 dB near 0.1·ω0 and the resonant peak |L(jω0)| = k/(2ζω0) = 1.25 lifts
  // it above 0 dB again (closed form: |L(jω)| = k / (ω·|1 − ω²/ω0² + j2ζω/ω0|)).
  const w0 = 2 * Math.PI * 10e6;
  const zeta = 0.04;
  const k = 0.1 * w0;
  const re = -zeta * w0;
  const im = w0 * Math.sqrt(1 - zeta * zeta);
  const pz: PoleZeroForm = {
    poles: [
      { re: 0, im: 0 },
      { re, im },
      { re, im: -im },
    ],
    zeros: [],
    k: k * w0 * w0,
  };
  const span = frequencySpan(pz, 1, [Infinity]);
  const { grid, samples } = sampleLogGrid(pz, span.lo, span.hi);
  const loop = loopMetrics({
    open: pz,
    samples,
    closedPoles: [],
    dcGain: Infinity,
    beta: 1,
    sign: 1,
    grid,
    tiny: span.tiny,
    d: 0,
  });
  const mag = (w: number) => k / (w * Math.hypot(1 - (w / w0) ** 2, (2 * zeta * w) / w0));
  /** Crossings of the closed form by bisection on a fine grid: an independent reference. */
  function referenceCrossings(): number[] {
    const out: number[] = [];
    let prev = 1e3;
    for (let i = 1; i <= 20000; i++) {
      const w = 1e3 * 10 ** (i * (7 / 20000));
      if (mag(prev) > 1 !== mag(w) > 1) {
        let a = prev;
        let b = w;
        for (let j = 0; j < 100; j++) {
          const m = Math.sqrt(a * b);
          if (mag(a) > 1 === mag(m) > 1) a = m;
          else b = m;
        }
        out.push(Math.sqrt(a * b) / (2 * Math.PI));
      }
      prev = w;
    }
    return out;
  }

  it('finds every crossing, and a minimum UGF is judged on the lowest', () => {
    const ref = referenceCrossings();
    expect(ref).toHaveLength(3);
    expect(loop.crossings.map((c) => c.hz)).toHaveLength(3);
    loop.crossings.forEach((c, i) => expect(Math.abs(c.hz / ref[i]! - 1)).toBeLessThan(1e-9));
    expect(loop.lowestUgfHz).toBeCloseTo(ref[0]!, 0);
    expect(loop.ugfHz).toBeCloseTo(ref[2]!, 0);
    const req = { kind: 'ugf', op: '>=', value: ref[1]! } as unknown as Requirement;
    const m = measure(req, { loop } as never);
    // Judged on the lowest crossing, it fails a limit between the first and the last crossing.
    expect(m.pass).toBe(false);
    expect(m.measured).toMatch(/lowest of several/);
  });

  it('reads the phase margin at the worst crossing', () => {
    // Reference: 180° + arg L(jω) at each crossing, from the closed form (−90° − the resonance's angle).
    const phase = (hz: number) => {
      const w = 2 * Math.PI * hz;
      return -90 - (Math.atan2((2 * zeta * w) / w0, 1 - (w / w0) ** 2) * 180) / Math.PI;
    };
    const margins = referenceCrossings().map((hz) => 180 + phase(hz));
    expect(loop.phaseMarginDeg!).toBeCloseTo(Math.min(...margins), 6);
  });
});

describe('a DC gain of exactly 1 has no crossing', () => {
  it('an RC ladder driven at unity gain reports no UGF', () => {
    // v(a) = gm·R·v(in) = 1 mS · 1 kohm = 1 exactly at DC; the ladder only falls from there.
    const text = `design ladder
  node a, b
  element gm in -> a = 1 mS
  element res a gnd = 1 kohm
  element res a b = 1 kohm
  element cap b gnd = 1 pF
  element res b out = 1 kohm
  element cap out gnd = 1 pF
  output out
end
`;
    const a = nominal(text);
    expect(Math.abs(a.dcGain - 1)).toBeLessThan(1e-9);
    expect(a.loop.crossings).toEqual([]);
    expect(a.loop.ugfHz).toBeUndefined();
  });
});

describe('fixes that solve their own rule', () => {
  it('a gain-margin fix is solved on the gain margin, and the nearest value that meets it is offered', () => {
    const text = `design nested_gm
  param gm1 = 50 uS
  stage first   gm = gm1     rout = 1 Mohm    cap = 50 fF
  stage second  gm = 200 uS  rout = 500 kohm  cap = 100 fF
  stage third   gm = 4 mS    rout = 50 kohm   cap = 300 fF  inverting
  load cap = 100 pF
  miller first  -> third  cc = 3 pF
  miller second -> third  cc = 3 pF
  require ugf >= 1.5 MHz
  require gainmargin >= 10 dB
end
`;
    const gm = analyzeDocument(text).findings.find((f) => f.code === 'gain-margin')!;
    const fix = gm.fixes.find((f) => f.preferred)!;
    expect(fix.title).toMatch(/gain margin 10\.\d dB/);
    expect(fix.title).not.toMatch(/— but/);
    const after = nominal(apply(text, fix.edits));
    // The rounded value meets the rule and lies at its edge: within 0.5 dB of the 10 dB asked.
    expect(after.loop.gainMarginDb!).toBeGreaterThanOrEqual(10);
    expect(after.loop.gainMarginDb!).toBeLessThan(10.5);
    expect(after.loop.lowestUgfHz!).toBeGreaterThanOrEqual(1.5e6);
    expect(codes(analyzeDocument(apply(text, fix.edits)).findings)).not.toContain('gain-margin');
  });

  it('finds the window of a phase margin that rises and falls again with Cc (indirect compensation)', () => {
    const text = `design indirect_window
  stage first   gm = 100 uS  rout = 1 Mohm    cap = 0.2 pF
  stage second  gm = 1 mS    rout = 100 kohm  cap = 0.5 pF  inverting
  load cap = 5 pF
  indirect second -> first  cc = 0.3 pF  gm = 200 uS  cap = 0.1 pF
  require pm >= 65 deg
end
`;
    // Reference: the phase margin of the exact model on a scan of cc (this project's analysis, one point at
    // a time) rises above 65° and falls below it again: a window, not a threshold.
    const pmAt = (cc: number) => nominal(text.replace('cc = 0.3 pF', `cc = ${cc} pF`)).loop.phaseMarginDeg!;
    expect(pmAt(0.3)).toBeLessThan(65);
    expect(pmAt(0.6)).toBeGreaterThan(65);
    expect(pmAt(1.2)).toBeLessThan(65);
    for (const start of [0.3, 1.2]) {
      const t = text.replace('cc = 0.3 pF', `cc = ${start} pF`);
      const pm = analyzeDocument(t).findings.find((f) => f.code === 'phase-margin')!;
      const fix = pm.fixes.find((f) => f.preferred)!;
      expect(fix, `from ${start} pF`).toBeDefined();
      const after = nominal(apply(t, fix.edits));
      expect(after.loop.phaseMarginDeg!).toBeGreaterThanOrEqual(65);
      const cc = parseDocument(apply(t, fix.edits)).designs[0]!.nominal!.buffered[0]!.cc;
      // From below the window the lower edge is nearer; from above, the upper edge.
      if (start < 0.6) expect(cc).toBeLessThan(0.6e-12);
      else expect(cc).toBeGreaterThan(0.6e-12);
    }
  });

  it('says why when no value meets the rule', () => {
    const text = POLARITY_SLIP.replace(
      'stage second  gm = 1 mS',
      'stage second  gm = 1 mS  inverting',
    ).replace('require pm >= 60 deg', 'require pm >= 89.9 deg');
    const pm = analyzeDocument(text).findings.find((f) => f.code === 'phase-margin')!;
    const disabled = pm.fixes.find((f) => f.disabled !== undefined)!;
    expect(disabled.edits).toEqual([]);
    expect(disabled.disabled).toMatch(/no value of cc from .* meets it/);
  });

  it('a rule of thumb is information when the phase margin it stands for is stated and met', () => {
    // With the zero a decade above and p2 at 2.2 × UGF the margin is about 60° (AH, common practice): here
    // the margin is stated at 45° and met, so a p2 below 2.2 × UGF is no warning.
    const text = `design proxy
  stage first   gm = 100 uS  rout = 2 Mohm    cap = 150 fF
  stage second  gm = 2 mS    rout = 200 kohm  cap = 200 fF  inverting
  load cap = 3 pF
  miller first -> second  cc = 0.7 pF  rz = 500 ohm
  require pm >= 45 deg
end
`;
    const report = analyzeDocument(text);
    const pm = report.designs[0]!.runs[0]!.analysis.loop.phaseMarginDeg!;
    expect(pm).toBeGreaterThanOrEqual(45);
    const nd = report.findings.find((f) => f.code === 'nondominant-pole');
    if (nd) {
      expect(nd.severity).toBe('info');
      expect(nd.fixes).toEqual([]);
    }
    expect(report.findings.filter((f) => f.severity !== 'info').map((f) => f.code)).not.toContain(
      'nondominant-pole',
    );
  });
});

// Loop metrics against elementary closed forms and a brute-force scan.
import { describe, expect, it } from 'vitest';
import { analyzeDesign, loopResponse, loopResponsePz } from '../../../shared/src/analysis';
import { unityCrossings, logGrid } from '../../../shared/src/analysis/loop';
import { magnitudeSquared, unwrappedPhaseDeg } from '../../../shared/src/analysis/frequency';
import { chain, relErr } from './buildModel';

const deg = (r: number) => (r * 180) / Math.PI;

describe('loop metrics', () => {
  it('one pole: UGF = p·√(L0² − 1), PM = 180° − atan√(L0² − 1), no phase crossover', () => {
    const [gm, r, c, beta] = [1e-3, 1e5, 1e-12, 0.5];
    const a = analyzeDesign(chain([{ gm, r, c }], beta));
    const l0 = beta * gm * r;
    const p = 1 / (r * c);
    // |L0/(1 + jω/p)| = 1 (elementary).
    const w = p * Math.sqrt(l0 * l0 - 1);
    expect(relErr(a.loop.ugfHz! * 2 * Math.PI, w)).toBeLessThan(1e-10);
    expect(Math.abs(a.loop.phaseMarginDeg! - (180 - deg(Math.atan(w / p))))).toBeLessThan(1e-8);
    expect(a.loop.gainMarginDb).toBeUndefined();
    expect(a.loop.crossings).toHaveLength(1);
    expect(relErr(a.loop.dcGain, l0)).toBeLessThan(1e-12);
    // Open-loop unity gain at p·√((gm·r)² − 1).
    expect(relErr(a.openLoopUgfHz! * 2 * Math.PI, p * Math.sqrt((gm * r) ** 2 - 1))).toBeLessThan(1e-10);
  });

  it('finds a crossing far below the pole when the DC loop gain is barely above unity', () => {
    const [gm, r, c] = [1e-3, 1000.02, 1e-12];
    const a = analyzeDesign(chain([{ gm, r, c }]));
    const l0 = gm * r;
    // |L0/(1 + jω/p)| = 1 at ω = p·√(L0² − 1) (elementary), here 0.0063·p.
    const w = (1 / (r * c)) * Math.sqrt(l0 * l0 - 1);
    expect(relErr(a.loop.ugfHz! * 2 * Math.PI, w)).toBeLessThan(1e-8);
  });

  it('two poles: crossing from (1 + x/p1²)(1 + x/p2²) = L0², PM = 180° − atan(ω/p1) − atan(ω/p2)', () => {
    const sections = [
      { gm: 1e-4, r: 1e6, c: 1e-12 },
      { gm: 1e-3, r: 1e4, c: 1e-13 },
    ];
    const a = analyzeDesign(chain(sections));
    const [p1, p2] = sections.map((s) => 1 / (s.r * s.c));
    const l0 = sections.reduce((g, s) => g * s.gm * s.r, 1);
    // x = ω²: x²/(p1²p2²) + x(1/p1² + 1/p2²) + 1 − L0² = 0 (elementary).
    const A = 1 / (p1 * p1 * p2 * p2);
    const B = 1 / (p1 * p1) + 1 / (p2 * p2);
    const x = (-B + Math.sqrt(B * B - 4 * A * (1 - l0 * l0))) / (2 * A);
    const w = Math.sqrt(x);
    expect(relErr(a.loop.ugfHz! * 2 * Math.PI, w)).toBeLessThan(1e-9);
    expect(
      Math.abs(a.loop.phaseMarginDeg! - (180 - deg(Math.atan(w / p1)) - deg(Math.atan(w / p2)))),
    ).toBeLessThan(1e-7);
    expect(a.loop.gainMarginDb).toBeUndefined();
  });

  it('three equal poles: phase crossover at p·√3 and gain margin −20·log10(L0/8)', () => {
    const s = { gm: 1e-4, r: 1e5, c: 1e-12 };
    const a = analyzeDesign(chain([s, s, s]));
    const p = 1 / (s.r * s.c);
    const l0 = (s.gm * s.r) ** 3;
    // 3·atan(ω/p) = 180° at ω = p·tan 60° = p√3, where |1 + j√3|³ = 8 (elementary).
    expect(relErr(a.loop.phaseCrossoverHz! * 2 * Math.PI, p * Math.sqrt(3))).toBeLessThan(1e-9);
    expect(Math.abs(a.loop.gainMarginDb! - -20 * Math.log10(l0 / 8))).toBeLessThan(1e-8);
    // L0 = 1000 > 8: unstable, negative phase margin.
    expect(a.loop.phaseMarginDeg!).toBeLessThan(0);
  });

  it('an inverting amplifier is normalised to negative feedback at DC (phase 0° at DC)', () => {
    const sections = [
      { gm: 1e-4, r: 1e6, c: 1e-12 },
      { gm: 1e-3, r: 1e4, c: 1e-13, inverting: true },
    ];
    const a = analyzeDesign(chain(sections));
    const b = analyzeDesign(chain(sections.map((s) => ({ ...s, inverting: false }))));
    expect(a.dcGain).toBeLessThan(0);
    expect(a.loop.phaseMarginDeg).toBeCloseTo(b.loop.phaseMarginDeg!, 10);
    const hz = [1, 1e3, 1e6, 1e9];
    const direct = loopResponse(chain(sections), hz);
    expect(Math.abs(direct.phaseDeg[0])).toBeLessThan(1e-3);
    const pz = loopResponsePz(chain(sections), hz);
    direct.phaseDeg.forEach((p, i) => expect(Math.abs(p - pz.phaseDeg[i])).toBeLessThan(1e-6));
  });

  it('finds all three crossings of a loop with a resonant peak, against a brute-force scan', () => {
    // L(s) = K(1 + s/10)²/((1 + s)²(s² + 2ζω0 s + ω0²)/ω0²), ζ = 0.05, ω0 = 1000: flat at K/100 between
    // the zeros and the resonance, peaking 1/(2ζ) = 10× there, so K = 30 crosses unity three times.
    const w0 = 1000;
    const zeta = 0.05;
    const pz = {
      zeros: [
        { re: -10, im: 0 },
        { re: -10, im: 0 },
      ],
      poles: [
        { re: -1, im: 0 },
        { re: -1, im: 0 },
        { re: -zeta * w0, im: w0 * Math.sqrt(1 - zeta * zeta) },
        { re: -zeta * w0, im: -w0 * Math.sqrt(1 - zeta * zeta) },
      ],
      // K·(1/100)·ω0² scales the factored form to the (s − root) form.
      k: 30 * (1 / 100) * w0 * w0,
    };
    const found = unityCrossings(pz, logGrid(1e-3, 1e7));
    // Brute force: a million log-spaced samples, counting sign changes of |L| − 1.
    let count = 0;
    let prev = magnitudeSquared(pz, 1e-3) - 1;
    for (let i = 1; i <= 1e6; i++) {
      const w = 1e-3 * 1e10 ** (i / 1e6);
      const v = magnitudeSquared(pz, w) - 1;
      if (v > 0 !== prev > 0) count++;
      prev = v;
    }
    expect(count).toBe(3);
    expect(found).toHaveLength(3);
    expect(found.map((c) => c.down)).toEqual([true, false, true]);
    for (const c of found) expect(Math.abs(magnitudeSquared(pz, c.omega) - 1)).toBeLessThan(1e-9);
    // The phase at the last crossing, summed directly from the factors with atan2.
    const w = found[2].omega;
    const direct =
      2 * Math.atan2(w, 10) -
      2 * Math.atan2(w, 1) -
      Math.atan2(w - pz.poles[2].im, -pz.poles[2].re) -
      Math.atan2(w - pz.poles[3].im, -pz.poles[3].re) +
      Math.atan2(-pz.poles[2].im, -pz.poles[2].re) +
      Math.atan2(-pz.poles[3].im, -pz.poles[3].re);
    expect(Math.abs(unwrappedPhaseDeg(pz, w, 0) - deg(direct))).toBeLessThan(1e-9);
  });

  it('reports closed-loop peaking for a lightly damped loop and none for a well-damped one', () => {
    // Two poles far apart with L0 large: closed-loop ωn² = p1p2(1 + L0), 2ζωn = p1 + p2 (elementary);
    // peak of a second-order low-pass 1/(2ζ√(1 − ζ²)) for ζ < 1/√2 (any control text).
    const sections = [
      { gm: 1e-4, r: 1e6, c: 1e-12 },
      { gm: 1e-3, r: 1e4, c: 1e-12 },
    ];
    const a = analyzeDesign(chain(sections));
    const [p1, p2] = sections.map((s) => 1 / (s.r * s.c));
    const l0 = sections.reduce((g, s) => g * s.gm * s.r, 1);
    const wn = Math.sqrt(p1 * p2 * (1 + l0));
    const zeta = (p1 + p2) / (2 * wn);
    const peak = 20 * Math.log10(1 / (2 * zeta * Math.sqrt(1 - zeta * zeta)));
    expect(Math.abs(a.loop.peakingDb - peak)).toBeLessThan(1e-6);
    const b = analyzeDesign(chain([{ gm: 1e-4, r: 1e6, c: 1e-12 }]));
    expect(b.loop.peakingDb).toBe(0);
  });
});

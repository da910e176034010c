// Closed-loop step response against the textbook first- and second-order forms.
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../../shared/src/analysis';
import { chain, relErr } from './buildModel';

describe('step response', () => {
  it('first order: y = F(1 − e^(−pt)), settling time ln(1/tol)/p with p = (1 + L0)/(RC)', () => {
    const [gm, r, c] = [1e-4, 1e5, 1e-12];
    const a = analyzeDesign(chain([{ gm, r, c }]), { settleTolerance: 1e-3 });
    const l0 = gm * r;
    const p = (1 + l0) / (r * c);
    const final = l0 / (1 + l0);
    const step = a.step!;
    expect(relErr(step.final, final)).toBeLessThan(1e-12);
    step.t.forEach((t, i) =>
      expect(Math.abs(step.y[i] - final * (1 - Math.exp(-p * t)))).toBeLessThan(1e-12),
    );
    // |y − F| = F·e^(−pt) = tol·F (elementary).
    expect(relErr(step.settlingTime!, Math.log(1e3) / p)).toBeLessThan(1e-8);
    expect(step.overshootPct).toBe(0);
  });

  it('second order underdamped: overshoot exp(−πζ/√(1 − ζ²)) and the exact waveform', () => {
    const sections = [
      { gm: 1e-4, r: 1e6, c: 1e-12 },
      { gm: 1e-3, r: 1e4, c: 1e-12 },
    ];
    const a = analyzeDesign(chain(sections));
    const [p1, p2] = sections.map((s) => 1 / (s.r * s.c));
    const l0 = sections.reduce((g, s) => g * s.gm * s.r, 1);
    // T(s) = L0·p1p2/(s² + (p1 + p2)s + p1p2(1 + L0)): ωn, ζ, and the step of a second-order low-pass
    // without zeros (any control text, e.g. Franklin, Powell & Emami-Naeini ch. 3).
    const wn = Math.sqrt(p1 * p2 * (1 + l0));
    const zeta = (p1 + p2) / (2 * wn);
    const wd = wn * Math.sqrt(1 - zeta * zeta);
    const final = l0 / (1 + l0);
    const y = (t: number) =>
      final *
      (1 -
        Math.exp(-zeta * wn * t) *
          (Math.cos(wd * t) + (zeta / Math.sqrt(1 - zeta * zeta)) * Math.sin(wd * t)));
    const step = a.step!;
    step.t.forEach((t, i) => expect(Math.abs(step.y[i] - y(t))).toBeLessThan(1e-10));
    const overshoot = 100 * Math.exp((-Math.PI * zeta) / Math.sqrt(1 - zeta * zeta));
    expect(Math.abs(step.overshootPct - overshoot)).toBeLessThan(1e-6);
    // Settling: the last time |y − F| leaves the band, checked on the exact waveform just before and after.
    const ts = step.settlingTime!;
    const band = step.tolerance * final;
    expect(Math.abs(Math.abs(y(ts) - final) - band)).toBeLessThan(1e-9);
    for (let k = 1; k <= 2000; k++)
      expect(Math.abs(y(ts * (1 + k * 1e-3)) - final)).toBeLessThanOrEqual(band * (1 + 1e-9));
  });

  it('is exact for a repeated (critically damped) closed-loop pole: y = F(1 − (1 + ωn t)e^(−ωn t))', () => {
    const p1 = 1e6;
    const p2 = 4e6;
    // ζ = 1 when (p1 + p2)² = 4p1p2(1 + L0), i.e. L0 = (p1 + p2)²/(4p1p2) − 1 = 0.5625.
    const l0 = (p1 + p2) ** 2 / (4 * p1 * p2) - 1;
    const sections = [
      { gm: 1e-5, r: 1e5, c: 1 / (1e5 * p1) },
      { gm: l0 / 1e-5 / 1e5 / 1e5, r: 1e5, c: 1 / (1e5 * p2) },
    ];
    const a = analyzeDesign(chain(sections));
    const wn = (p1 + p2) / 2;
    const final = l0 / (1 + l0);
    const step = a.step!;
    step.t.forEach((t, i) =>
      expect(Math.abs(step.y[i] - final * (1 - (1 + wn * t) * Math.exp(-wn * t)))).toBeLessThan(1e-9),
    );
    expect(a.closedLoopPoles![0].im).toBe(0);
  });

  it('an unstable loop has no settling time', () => {
    const s = { gm: 1e-4, r: 1e5, c: 1e-12 };
    const a = analyzeDesign(chain([s, s, s]));
    expect(a.closedLoopPoles!.some((p) => p.re > 0)).toBe(true);
    expect(a.step!.settlingTime).toBeUndefined();
  });

  it('can be skipped for sweeps and synthesis', () => {
    const a = analyzeDesign(chain([{ gm: 1e-4, r: 1e5, c: 1e-12 }]), { step: false });
    expect(a.step).toBeUndefined();
  });
});

// The load step of a loop written as a circuit against its closed form. A follower whose transconductor
// drives its own output node (R, C to ground) and senses it: T(s) = gR/(1 + sRC), and a current injected
// into the output sees Zout(s) = R/(1 + gR + sRC) (shunt feedback divides the output resistance by 1 + T;
// first-order circuit analysis, derived here). A load step of 1 A drawn from the output therefore moves it
// by −Zout(0)·(1 − e^(−t/τ)) with Zout(0) = R/(1 + gR) and τ = RC/(1 + gR): monotone, its peak deviation is
// Zout(0), and it stays within 1 % of that peak from its final value after τ·ln(100).
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../../shared/src/analysis';
import { parseDocument } from '../../../shared/src/language';

const [g, r, c] = [2e-3, 50e3, 20e-12];
const TEXT = `design follower
  stage amp from in, amp gm = 2 mS rout = 50 kohm cap = 20 pF
  feedback at amp
  require loadstep <= 1 mV for 1 mA
end
`;

describe('load step of a first-order follower (closed form)', () => {
  const model = parseDocument(TEXT).designs[0]!.nominal!;
  const a = analyzeDesign(model);
  const ls = a.closedCircuit!.loadStep!;
  const z0 = r / (1 + g * r);
  const tau = (r * c) / (1 + g * r);

  it('ends at −Zout(0) = −R/(1 + gR)', () => {
    expect(Math.abs(ls.final + z0) / z0).toBeLessThan(1e-10);
    expect(Math.abs(a.closedCircuit!.outputImpedance.dcOhm - z0) / z0).toBeLessThan(1e-10);
  });

  it('its peak deviation is Zout(0) (monotone response)', () => {
    expect(Math.abs(ls.peakDeviation - z0) / z0).toBeLessThan(1e-6);
  });

  it('recovers to within 1 % of its peak after τ·ln(100), τ = RC/(1 + gR)', () => {
    expect(ls.tolerance).toBe(0.01);
    expect(Math.abs(ls.settlingTime! - tau * Math.log(100)) / (tau * Math.log(100))).toBeLessThan(1e-6);
  });

  it('the loop gain is T(0) = gR and the closed loop is a unity follower', () => {
    expect(Math.abs(a.dcGain - g * r) / (g * r)).toBeLessThan(1e-12);
    expect(Math.abs(a.closedLoopGain!.dc - (g * r) / (1 + g * r))).toBeLessThan(1e-12);
  });
});

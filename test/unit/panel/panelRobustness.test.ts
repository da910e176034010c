// The panel's data for slider values and tolerances at the edge of double precision: refused with a
// reason, in bounded time, and the DC gain's exact states in words.
import { describe, expect, it } from 'vitest';
import { buildPanelData } from '../../../shared/src/panel/buildPanelData';
import { DC_GAIN_ZERO } from '../../../shared/src/format/special';
import { parseDocument } from '../../../shared/src/language';
import { buildModel } from '../analysis/buildModel';

const amp = () =>
  buildModel({
    stages: [
      { name: 'first', input: 'in', gm: 1e-4, rout: 2e6, cap: 150e-15 },
      { name: 'second', input: 'first', gm: 3.5e-4, rout: 2e5, cap: 200e-15, inverting: true },
    ],
    loads: [{ cap: 1e-12, res: 2e6 }],
    millers: [{ from: 'first', to: 'second', cc: 1e-12 }],
  });

describe('panel data at the edge of double precision', () => {
  it.each([1e308, Infinity, NaN, -1e-12, 1e-320])('a slider Cc of %s is refused with a reason', (cc) => {
    const data = buildPanelData(amp(), 'file:///x', { cc })!;
    expect(data.problems.join(' ')).toMatch(/Cc from the slider/);
    // The sliders stay usable at the written value.
    expect(data.cc).toBe(1e-12);
    expect(data.sliders).toBeDefined();
  });

  it('a slider Rz of 1e308 ohm is refused; 0 still removes the resistor', () => {
    expect(buildPanelData(amp(), 'file:///x', { rz: 1e308 })!.problems.join(' ')).toMatch(
      /Rz from the slider/,
    );
    expect(buildPanelData(amp(), 'file:///x', { rz: 0 })!.problems).toEqual([]);
  });

  it('an ordinary slider value is drawn', () => {
    const data = buildPanelData(amp(), 'file:///x', { cc: 2e-12 })!;
    expect(data.problems).toEqual([]);
    expect(data.cc).toBe(2e-12);
    expect(data.step.t.length).toBeGreaterThan(0);
  });

  it('a tolerance the step response refuses leaves the step empty with the reason', () => {
    const data = buildPanelData(amp(), 'file:///x', { settleTolerance: 5e-324 })!;
    expect(data.problems).toEqual([]);
    expect(data.step.t).toEqual([]);
    expect(data.step.unavailable).toMatch(/settling tolerance/);
  });

  it('a network with a series capacitor reports its DC gain as "no DC path" in words', () => {
    const text = [
      'design blocked',
      '  node a',
      '  element gm in -> a = 100 uS',
      '  element res a gnd = 1 Mohm',
      '  element cap a out = 1 pF',
      '  element res out gnd = 10 kohm',
      '  output out',
      'end',
    ].join('\n');
    const model = parseDocument(text).designs[0]!.nominal!;
    expect(buildPanelData(model, 'file:///x')!.summary.dcGainText).toBe(DC_GAIN_ZERO);
  });
});

// Judging a sweep: a requirement that fails only inside a dip narrower than the sample spacing is found,
// with its worst value and its sub-range, checked against a dense reference sweep of the same design.
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../../shared/src/language';
import { analyzeDocument } from '../../../shared/src/service';
import { failingRanges, formatSweptValue, sweepFindings } from '../../../shared/src/sweep/judgeSweep';
import { metricsOf, specOf, sweepDesign } from '../../../shared/src/sweep/sweepDesign';

/**
 * An invented buffer with a series resistor in its load capacitance: its phase margin dips to about 47.6°
 * near 59 pF (found by the dense sweep below). With four points (1 pF, 10 pF, 100 pF, 1 nF) every sample
 * passes 48° and the dip lies between two of them.
 */
const buffer = (pm: string, points = 4) => `design buf
  param cl = 10 pF
  stage first  gm = 100 uS rout = 2 Mohm cap = 150 fF
  stage second gm = 1 mS rout = 200 kohm cap = 200 fF inverting
  node esr
  element res second esr = 300 ohm
  element cap esr gnd = cl
  miller first -> second cc = 2 pF
  require pm >= ${pm}
  sweep cl from 1 pF to 1 nF points ${points}
end
`;

function sweepOf(text: string) {
  const source = parseDocument(text).designs[0]!;
  const sweep = source.nominal!.sweeps![0]!;
  return { source, sweep, result: sweepDesign(source, specOf(source, sweep)!) };
}

describe('sweep findings', () => {
  it('finds a failing dip between two passing samples, with the sub-range a dense sweep gives', () => {
    const { source, sweep, result } = sweepOf(buffer('48 deg'));
    const sampled = result.samples.map((s) => metricsOf(s.runs[0]!.analysis).phaseMarginDeg!);
    expect(sampled.every((pm) => pm >= 48)).toBe(true);

    // Reference: a dense sweep (601 points over the range), read point by point.
    const dense = sweepOf(buffer('48 deg', 601)).result.samples.map((s) => ({
      x: s.value,
      pm: metricsOf(s.runs[0]!.analysis).phaseMarginDeg!,
    }));
    const failing = dense.filter((d) => d.pm < 48);
    expect(failing.length).toBeGreaterThan(0);
    const step = 1000 ** (1 / 600); // ratio between neighbouring dense points
    const ranges = failingRanges(result, (s) => metricsOf(s.runs[0]!.analysis).phaseMarginDeg! < 48, [
      result.minima[0]!.phaseMarginDeg!.at,
    ]);
    expect(ranges).toHaveLength(1);
    expect(ranges[0]!.from / failing[0]!.x).toBeGreaterThan(1 / step);
    expect(ranges[0]!.from / failing[0]!.x).toBeLessThan(step);
    expect(ranges[0]!.to / failing[failing.length - 1]!.x).toBeGreaterThan(1 / step);
    expect(ranges[0]!.to / failing[failing.length - 1]!.x).toBeLessThan(step);

    const findings = sweepFindings(source, sweep.origin.range, result);
    expect(findings).toHaveLength(1);
    const f = findings[0]!;
    expect(f.code).toBe('sweep');
    expect(f.severity).toBe('error');
    expect(f.range).toEqual(sweep.origin.range);
    const worst = dense.reduce((a, b) => (b.pm < a.pm ? b : a));
    expect(f.message).toMatch(/^phase margin 47\.\d° at cl = /);
    expect(f.message).toContain(
      `at cl = ${formatSweptValue(result.spec, result.minima[0]!.phaseMarginDeg!.at)}`,
    );
    expect(Math.abs(result.minima[0]!.phaseMarginDeg!.value - worst.pm)).toBeLessThan(0.05);
    expect(f.message).toContain('is below the required 48.0°');
    expect(f.message).toContain(
      `fails for cl from ${formatSweptValue(result.spec, ranges[0]!.from)} to ${formatSweptValue(result.spec, ranges[0]!.to)}`,
    );
  });

  it('says nothing when the requirement holds over the whole range', () => {
    const { source, sweep, result } = sweepOf(buffer('45 deg'));
    expect(sweepFindings(source, sweep.origin.range, result)).toEqual([]);
  });

  it('says the whole range fails when it does', () => {
    const { source, sweep, result } = sweepOf(buffer('85 deg'));
    const [f] = sweepFindings(source, sweep.origin.range, result);
    expect(f!.message).toContain('fails over the whole sweep of cl');
  });

  it('is reported by analyzeDocument after the ordinary checks, with a summary for the editor', () => {
    const report = analyzeDocument(buffer('48 deg'));
    const design = report.designs[0]!;
    // The nominal design (cl = 10 pF) meets 48°: the only phase-margin finding is the sweep's.
    expect(design.findings.filter((f) => f.code === 'phase-margin')).toEqual([]);
    expect(design.findings.filter((f) => f.code === 'sweep')).toHaveLength(1);
    const summary = design.sweeps![0]!;
    expect(summary.param).toBe('cl');
    expect(summary.margins.phaseMarginDeg!.lowest.value).toBeLessThan(48);
    expect(summary.complete).toBe(true);
  });
});

// The sweep core: every point equals a single analysis of the design written at that value, and the
// lowest margin found between points agrees with a dense reference sweep.
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../../shared/src/language';
import { analyzeDocument } from '../../../shared/src/service';
import {
  locusOf,
  metricsOf,
  specOf,
  sweepDesign,
  sweepValues,
  writeValue,
} from '../../../shared/src/sweep/sweepDesign';

/** An invented buffer with an ESR-like series resistor in its load: its phase margin dips mid-range. */
const buffer = (cl = '10 pF', extra = '') => `design buf
  param cl = ${cl}
  param gm1 = 100 uS
  stage first  gm = gm1 rout = 2 Mohm cap = 150 fF
  stage second gm = 1 mS rout = 200 kohm cap = 200 fF inverting
  node esr
  element res second esr = 300 ohm
  element cap esr gnd = cl
  miller first -> second cc = 2 pF
  require pm >= 45 deg
  sweep cl from 1 pF to 1 nF points 13
  corner slow gm1 = 80 uS
${extra}end
`;

function sourceOf(text: string) {
  const doc = parseDocument(text);
  expect(doc.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
  return doc.designs[0]!;
}

describe('sweepDesign', () => {
  it('spaces points evenly on a log scale with exact ends', () => {
    const source = sourceOf(buffer());
    const spec = specOf(source, source.nominal!.sweeps![0]!)!;
    const v = sweepValues(spec);
    expect(v).toHaveLength(13);
    expect(v[0]).toBe(spec.low);
    expect(v[12]).toBe(spec.high);
    // Each step is a quarter decade: 10^(3/12) (the definition of a logarithmic grid).
    for (let i = 1; i < v.length; i++) expect(v[i]! / v[i - 1]!).toBeCloseTo(10 ** 0.25, 12);
  });

  it('equals a single analysis of the design written at each point, in every corner (exactly)', () => {
    const source = sourceOf(buffer());
    const result = sweepDesign(source, specOf(source, source.nominal!.sweeps![0]!)!);
    expect(result.complete).toBe(true);
    expect(result.corners).toEqual(['nominal', 'slow']);
    for (const sample of result.samples.filter((_, i) => i % 4 === 0)) {
      // Reference: the ordinary analysis of the text with the value written by hand into `param cl`.
      const single = analyzeDocument(buffer(writeValue(sample.value, 'F')!)).designs[0]!;
      single.runs.forEach((run, c) => {
        const swept = sample.runs[c]!;
        expect(swept.corner).toBe(run.corner);
        expect(metricsOf(swept.analysis)).toEqual(metricsOf(run.analysis));
        expect(swept.analysis.poles.map((p) => p.s)).toEqual(run.analysis.poles.map((p) => p.s));
      });
    }
  });

  it('sets the swept parameter in a corner that overrides it', () => {
    const text = buffer('10 pF', '  corner heavy cl = 500 pF\n');
    const source = sourceOf(text);
    const result = sweepDesign(source, specOf(source, source.nominal!.sweeps![0]!)!);
    const heavy = result.corners.indexOf('heavy');
    const nominal = result.samples[0]!.runs[0]!;
    // With the override replaced by the sweep's value, the corner is the nominal design at that value.
    expect(metricsOf(result.samples[0]!.runs[heavy]!.analysis)).toEqual(metricsOf(nominal.analysis));
  });

  it('finds the lowest phase margin between points as a dense sweep (10× the points) does, to 0.05°', () => {
    const source = sourceOf(buffer());
    // Half a decade between points, so that the samples alone miss the minimum.
    const spec = { ...specOf(source, source.nominal!.sweeps![0]!)!, points: 7 };
    const coarse = sweepDesign(source, spec);
    const dense = sweepDesign(source, { ...spec, points: spec.points * 10 });
    coarse.corners.forEach((_, c) => {
      // Reference: the lowest sampled value of the dense sweep (its own refinement not used).
      const denseMin = Math.min(...dense.samples.map((s) => metricsOf(s.runs[c]!.analysis).phaseMarginDeg!));
      const coarseSampled = Math.min(
        ...coarse.samples.map((s) => metricsOf(s.runs[c]!.analysis).phaseMarginDeg!),
      );
      const refined = coarse.minima[c]!.phaseMarginDeg!;
      expect(Math.abs(refined.value - denseMin)).toBeLessThanOrEqual(0.05);
      // The refinement is not idle on this case: the coarse samples alone miss the minimum by more.
      expect(coarseSampled - denseMin).toBeGreaterThan(0.05);
      expect(refined.at).toBeGreaterThan(spec.low);
      expect(refined.at).toBeLessThan(spec.high);
    });
  });

  it('stops between points when cancelled', () => {
    const source = sourceOf(buffer());
    let n = 0;
    const token = {
      get isCancellationRequested() {
        return ++n > 3;
      },
    };
    const result = sweepDesign(source, specOf(source, source.nominal!.sweeps![0]!)!, token);
    expect(result.complete).toBe(false);
    expect(result.samples.length).toBe(3);
  });

  it('keeps the poles and zeros along the sweep', () => {
    const source = sourceOf(buffer());
    const result = sweepDesign(source, specOf(source, source.nominal!.sweeps![0]!)!);
    const locus = locusOf(result, 0);
    expect(locus).toHaveLength(13);
    expect(locus[0]!.poles).toEqual(result.samples[0]!.runs[0]!.analysis.poles.map((p) => p.s));
  });
});

// The shortcut that sets a swept value straight into the model is taken only where it gives the models
// the design's text gives; elsewhere each point is parsed.
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../../shared/src/language';
import { modelSource, modelsFromText } from '../../../shared/src/sweep/modelsAt';
import { brentMin } from '../../../shared/src/numeric/roots';
import { specOf, sweepValues } from '../../../shared/src/sweep/sweepDesign';

const design = (load: string, extra = '') => `design buf
  param cl = 10 pF
  stage first  gm = 100 uS rout = 2 Mohm cap = 150 fF
  stage second gm = 1 mS rout = 200 kohm cap = 200 fF inverting
  node esr
  element res second esr = 300 ohm
  element cap esr gnd = ${load}
  miller first -> second cc = 2 pF
  require pm >= 45 deg
  sweep cl from 1 pF to 1 nF points 9
${extra}end
`;

function setup(text: string) {
  const source = parseDocument(text).designs[0]!;
  const spec = specOf(source, source.nominal!.sweeps![0]!)!;
  const corners = ['nominal', ...source.corners.map((c) => c.name)];
  return { source, spec, corners, models: modelSource(source, spec, corners) };
}

describe('modelSource', () => {
  it('sets a parameter used only as a whole value directly, equal to the text at every point', () => {
    const { source, spec, corners, models } = setup(design('cl', '  corner heavy cl = 500 pF\n'));
    expect(models.way).toBe('direct');
    for (const v of sweepValues(spec)) {
      const fromText = modelsFromText(source, spec, corners, v);
      const direct = models.at(v);
      direct.forEach((m, i) => {
        // The reference: the value written into the text and parsed.
        expect(m!.elements).toEqual(fromText[i]!.elements);
        expect(m!.params.map((p) => p.value)).toEqual(fromText[i]!.params.map((p) => p.value));
      });
    }
  });

  it('parses each point when the parameter appears inside an expression', () => {
    expect(setup(design('2 * cl')).models.way).toBe('text');
  });

  it('parses each point when another parameter is derived from it', () => {
    const derived = design('cl').replace(
      'element cap esr gnd = cl',
      'element cap esr gnd = k\n  param k = cl * 3',
    );
    expect(setup(derived).models.way).toBe('text');
  });
});

describe('brentMin (the minimum between two sweep samples)', () => {
  it('finds the vertex of a parabola and of a narrow dip to the tolerance asked for', () => {
    // (x − 0.3)² + 1 has its least value 1 at x = 0.3 (calculus).
    const p = brentMin((x) => (x - 0.3) ** 2 + 1, 0, 1, 1e-6);
    expect(p.x).toBeCloseTo(0.3, 5);
    expect(p.value).toBeCloseTo(1, 10);
    // A Lorentzian dip of half-width 0.01 at 0.61: least −1 there (its definition).
    const dip = brentMin((x) => -1 / (1 + ((x - 0.61) / 0.01) ** 2), 0.5, 0.7, 1e-6);
    expect(dip.x).toBeCloseTo(0.61, 5);
  });

  it('calls the function far fewer times than golden section for the same width', () => {
    let calls = 0;
    brentMin(
      (x) => {
        calls++;
        return Math.cosh(x - 0.2);
      },
      -1,
      1,
      1e-4,
    );
    // Golden section shrinks by 0.618 per call: ln(2e4)/ln(1.618) ≈ 21 calls for this width.
    expect(calls).toBeLessThan(15);
  });
});

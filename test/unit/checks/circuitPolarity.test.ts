// A loop written as a circuit whose return ratio is negative at DC: the finding states T(0) with its sign,
// and the offered polarity flip, applied, gives negative feedback and a stable closed loop (re-analysed
// from the edited text, independently of the fix's own check).
import { describe, expect, it } from 'vitest';
import { analyzeDocument } from '../../../shared/src/service';
import { applyEdits } from '../../../shared/src/text/applyEdits';

// An invented non-inverting gain-of-four stage with a polarity slip: `first` senses fb on its negative
// side, and `second` inverts, so the loop through the divider is positive at DC.
const TEXT = `design noninv_gain4
  node fb
  stage first from in, fb gm = 200 uS rout = 1 Mohm cap = 100 fF
  stage second gm = 2 mS rout = 100 kohm cap = 300 fF inverting
  miller first -> second cc = 0.5 pF
  element res second fb = 30 kohm
  element res fb gnd = 10 kohm
  load cap = 10 pF
  output second
  feedback at fb
end
`;

describe('positive feedback at DC in a loop written as a circuit', () => {
  const report = analyzeDocument(TEXT);
  const design = report.designs[0]!;
  const a = design.runs[0]!.analysis;
  const finding = design.findings.find((f) => f.code === 'stability')!;

  it('is an error on the `feedback` line that states T(0) with its sign', () => {
    // T(0) = −(gm1·r1)(gm2·r2)·r_fb/(r_fb + r_top) with the output loaded by the divider (hand analysis).
    const r2 = 1 / (1 / 100e3 + 1 / 40e3);
    const t0 = -(200e-6 * 1e6) * (2e-3 * r2) * (10 / 40);
    expect(Math.abs(a.dcGain - t0) / Math.abs(t0)).toBeLessThan(1e-9);
    expect(finding.severity).toBe('error');
    expect(finding.range.start.line).toBe(9);
    expect(finding.message).toMatch(/feeds back positively at DC \(T\(0\) = -2\.86 kV\/V\)/);
  });

  it('offers a polarity flip that, applied, makes the loop negative feedback and stable', () => {
    const fix = finding.fixes.find((f) => f.preferred)!;
    expect(fix.title).toMatch(/^Make stage \w+ (inverting|noninverting)/);
    const edited = applyEdits(TEXT, fix.edits)!;
    const after = analyzeDocument(edited).designs[0]!;
    for (const run of after.runs) {
      expect(run.analysis.dcGain).toBeGreaterThan(0);
      expect(run.analysis.stability?.verdict).toBe('stable');
    }
    expect(after.findings.filter((f) => f.code === 'stability')).toEqual([]);
  });

  it('gives no load-step deviation for the unstable loop (its output runs away)', () => {
    expect(a.stability?.verdict).toBe('unstable');
    expect(a.closedCircuit!.loadStep).toBeUndefined();
  });
});

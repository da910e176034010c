import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { analyzeDocument } from '../../../shared/src/service';

describe('a fix that breaks another stated requirement says so', () => {
  it('raising Cc for phase margin on the RHP-zero example costs its UGF requirement', () => {
    // Hand estimate (two-stage Miller, common practice): UGF ≈ gm1/(2π·Cc) = 100 uS/(2π·1.6 pF) ≈ 9.9 MHz,
    // below the example's `require ugf >= 10 MHz`, so the solved Cc for 60° must name the UGF it costs.
    const report = analyzeDocument(readFileSync('examples/twoStageRhpZero.ampnote', 'utf8'));
    const pm = report.findings.find((f) => f.code === 'phase-margin');
    expect(pm).toBeDefined();
    const setCc = pm!.fixes.find((f) => /Set cc =/.test(f.title));
    expect(setCc?.title).toMatch(/— but unity-gain frequency becomes [\d.]+ MHz \(required ≥ 10 MHz\)/);
  });

  it('a fix with no side effect keeps its plain title', () => {
    const report = analyzeDocument(readFileSync('examples/twoStageRhpZero.ampnote', 'utf8'));
    const rhp = report.findings.find((f) => f.code === 'rhp-zero');
    const rz = rhp!.fixes.find((f) => /moves the zero to infinity/.test(f.title));
    expect(rz?.title).not.toMatch(/— but/);
  });
});

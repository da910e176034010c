import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { analyzeDesign, solveRzToCancelPole, withValue } from '../../../shared/src/analysis';
import { parseDocument } from '../../../shared/src/language';

const twoStage = parseDocument(readFileSync('examples/twoStageRhpZero.ampnote', 'utf8')).designs[0]!.nominal!;
const nested = parseDocument(readFileSync('examples/threeStageNestedMiller.ampnote', 'utf8')).designs[0]!
  .nominal!;

describe('solveRzToCancelPole against a complex non-dominant pair', () => {
  it('the nested-Miller example has a complex first non-dominant pair (precondition)', () => {
    const poles = [...analyzeDesign(nested, { step: false }).poles].sort((a, b) => a.hz - b.hz);
    expect(Math.abs(poles[1]!.s.im)).toBeGreaterThan(0.1 * poles[1]!.hz * 2 * Math.PI);
  });

  it('refuses: a real zero cannot cancel a complex pair (a zero of a rational function is real or comes in conjugate pairs)', () => {
    for (const index of [0, 1]) {
      const r = solveRzToCancelPole(nested, index);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.reason).toMatch(/complex pair/);
    }
  });

  it('still solves the two-stage case, whose poles turn complex only for larger Rz than the answer', () => {
    const r = solveRzToCancelPole(twoStage, 0);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    // Definition of the target: the LHP zero's magnitude equals the first non-dominant pole's, and that pole is real.
    const a = analyzeDesign(withValue(twoStage, { kind: 'miller', index: 0, field: 'rz' }, r.value), {
      step: false,
    });
    const p2 = [...a.poles].sort((x, y) => x.hz - y.hz)[1]!;
    const z = a.zeros.filter((q) => !q.rhp && q.s.im === 0).sort((x, y) => x.hz - y.hz)[0]!;
    expect(p2.s.im).toBe(0);
    expect(Math.abs(z.hz / p2.hz - 1)).toBeLessThan(1e-6);
  });
});

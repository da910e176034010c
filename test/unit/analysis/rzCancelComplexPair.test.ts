import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { analyzeDesign, solveRzToCancelPole } from '../../../shared/src/analysis';
import { parseDocument } from '../../../shared/src/language';

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
});

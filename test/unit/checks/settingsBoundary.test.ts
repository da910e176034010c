// Settings are checked where they enter: a settling tolerance the step response cannot judge falls back to
// the default, and the terminal checker's config warns with the reason.
import { describe, expect, it } from 'vitest';
import { MIN_SETTLE_TOLERANCE } from '../../../shared/src/analysis/settleTolerance';
import { DEFAULT_CHECK_SETTINGS, resolveCheckSettings } from '../../../shared/src/checks/settings';
import { parseConfig } from '../../../cli/src/config';
import { analyzeDocument } from '../../../shared/src/service';

const DESIGN = [
  'design amp',
  '  stage first   gm = 100 uS  rout = 2 Mohm    cap = 150 fF  bias = 10 uA',
  '  stage second  gm = 350 uS  rout = 200 kohm  cap = 200 fF  bias = 100 uA  inverting',
  '  load cap = 1 pF res = 2 Mohm',
  '  miller first -> second  cc = 1 pF  rz = 5.6 kohm',
  'end',
].join('\n');

describe('settleTolerance at the settings boundary', () => {
  it.each([5e-324, 1e-320, 1e-13, NaN, Infinity, -1, 0, 1, 'x'])('refuses %s and keeps the default', (v) => {
    expect(resolveCheckSettings({ settleTolerance: v }).settleTolerance).toBe(
      DEFAULT_CHECK_SETTINGS.settleTolerance,
    );
  });

  it('accepts the smallest tolerance the step response judges, and ordinary ones', () => {
    for (const v of [MIN_SETTLE_TOLERANCE, 1e-6, 0.05]) {
      expect(resolveCheckSettings({ settleTolerance: v }).settleTolerance).toBe(v);
    }
  });

  it('the config file names the refused value and the reason', () => {
    const r = parseConfig('{"ampnote.checks": {"settleTolerance": 5e-324}}');
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.settings.settleTolerance).toBe(DEFAULT_CHECK_SETTINGS.settleTolerance);
      expect(r.warnings.join('\n')).toMatch(
        /settleTolerance" is refused: the settling tolerance .* is finer than/,
      );
    }
  });

  it('a document analysed with the tolerance 5e-324 passed straight in still gets a step response', () => {
    const report = analyzeDocument(DESIGN, { settleTolerance: 5e-324 });
    const a = report.designs[0]!.runs[0]!.analysis;
    expect(a.step?.tolerance).toBe(DEFAULT_CHECK_SETTINGS.settleTolerance);
  });
});

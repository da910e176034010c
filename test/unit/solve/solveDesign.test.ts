// The design solve against an independent brute force: a dense grid over the free parameters, each point
// analysed with the engine in every corner, the least objective that meets every constraint kept.
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../../shared/src/analysis/analyzeDesign';
import { DEFAULT_CHECK_SETTINGS } from '../../../shared/src/checks/settings';
import { parseDocument } from '../../../shared/src/language';
import type { DesignModel } from '../../../shared/src/language/model';
import { solveDesign } from '../../../shared/src/solve/solveDesign';
import { applyEdits } from '../../../shared/src/text/applyEdits';
import { analyzeDocument } from '../../../shared/src/service';

const settings = DEFAULT_CHECK_SETTINGS;

/** Every stated requirement, stability and the default gain margin, as the solve judges them. */
function meets(m: DesignModel, need: { pm: number; ugf: number }): boolean {
  const a = analyzeDesign(m, { step: false, participation: false });
  return (
    a.stability?.verdict === 'stable' &&
    (a.loop.phaseMarginDeg ?? -Infinity) >= need.pm &&
    (a.loop.lowestUgfHz ?? 0) >= need.ugf &&
    (a.loop.gainMarginDb === undefined || a.loop.gainMarginDb >= settings.gainMargin)
  );
}

const models = (text: string) => {
  const d = parseDocument(text).designs[0]!;
  return [d.nominal!, ...d.corners.map((c) => c.model!)];
};

describe('solve of a two-stage design against a grid', () => {
  // Sized like the two-stage example of Allen & Holberg ch. 6 (values from memory, rounded): gm1 ≈ 94 µS,
  // gm2 ≈ 943 µS, CL = 10 pF; the output resistances are invented for the test.
  const text = `design textbook_two_stage
  param cc = 3 pF free 0.3 pF .. 10 pF
  param rz = 1 kohm free 0 .. 5 kohm
  stage first   gm = 94 uS   rout = 1.5 Mohm  cap = 100 fF
  stage second  gm = 943 uS  rout = 150 kohm  cap = 300 fF  inverting
  load cap = 10 pF
  miller first -> second  cc = cc  rz = rz
  require pm  >= 60 deg
  require ugf >= 1 MHz
  corner slow  second.gm = 750 uS
end
`;
  const need = { pm: 60, ugf: 1e6 };

  it('finds the same least capacitance within 2 %, and the answer meets every requirement', () => {
    const result = solveDesign(parseDocument(text).designs[0]!, { settings });
    expect(result.status).toBe('met');
    const cc = result.values.find((v) => v.name === 'cc')!.after;
    // Brute force: cc on a 200-point logarithmic grid, rz on a 101-point linear grid, every corner.
    const base = models(text);
    let best = Infinity;
    for (let i = 0; i <= 200; i++) {
      const c = 0.3e-12 * (10 / 0.3) ** (i / 200);
      if (c >= best) break;
      for (let j = 0; j <= 100; j++) {
        const r = (5000 * j) / 100;
        const ok = base.every((m) =>
          meets({ ...m, millers: [{ ...m.millers[0]!, cc: c as never, rz: r as never }] }, need),
        );
        if (ok) {
          best = c;
          break;
        }
      }
    }
    expect(Number.isFinite(best)).toBe(true);
    expect(cc / best).toBeLessThan(1.02);
    // The solve may beat the grid between its points, but never by more than the grid step (1.8 %).
    expect(cc / best).toBeGreaterThan(0.98);
    const fixed = analyzeDocument(applyEdits(text, result.edits)!);
    expect(fixed.findings.filter((f) => f.severity === 'error')).toEqual([]);
    expect(result.binding.length).toBeGreaterThan(0);
  });
});

describe('solve of a nested three-stage design with corners', () => {
  const text = `design nested
  param c1 = 4 pF free 0.5 pF .. 20 pF
  param c2 = 4 pF free 0.5 pF .. 20 pF
  stage first   gm = 50 uS   rout = 1 Mohm    cap = 50 fF
  stage second  gm = 200 uS  rout = 500 kohm  cap = 100 fF
  stage third   gm = 2 mS    rout = 50 kohm   cap = 300 fF  inverting
  load cap = 20 pF
  miller first  -> third  cc = c1
  miller second -> third  cc = c2
  require pm  >= 55 deg
  require ugf >= 1 MHz
  corner slow  first.gm = 40 uS, third.gm = 1.6 mS
  corner fast  first.gm = 60 uS, third.gm = 2.4 mS
end
`;
  it('matches a 60 × 60 grid within 2 % of its least total capacitance', () => {
    const result = solveDesign(parseDocument(text).designs[0]!, { settings });
    expect(result.status).toBe('met');
    const total = result.objective.after;
    const base = models(text);
    let best = Infinity;
    const grid = Array.from({ length: 60 }, (_, i) => 0.5e-12 * 40 ** (i / 59));
    for (const a of grid)
      for (const b of grid) {
        if (a + b >= best) continue;
        const ok = base.every((m) =>
          meets(
            {
              ...m,
              millers: [
                { ...m.millers[0]!, cc: a as never },
                { ...m.millers[1]!, cc: b as never },
              ],
            },
            { pm: 55, ugf: 1e6 },
          ),
        );
        if (ok) best = a + b;
      }
    expect(Number.isFinite(best)).toBe(true);
    expect(total / best).toBeLessThan(1.02);
    const fixed = analyzeDocument(applyEdits(text, result.edits)!);
    expect(fixed.findings.filter((f) => f.severity === 'error')).toEqual([]);
  });
});

describe('infeasible solves name what conflicts', () => {
  it('bounds too tight: the phase margin cannot be met with so little capacitance', () => {
    const text = `design tight
  param cc = 0.1 pF free 0.05 pF .. 0.2 pF
  stage first   gm = 100 uS  rout = 2 Mohm    cap = 150 fF
  stage second  gm = 1 mS    rout = 200 kohm  cap = 200 fF  inverting
  load cap = 10 pF
  miller first -> second  cc = cc
  require pm >= 60 deg
end
`;
    const result = solveDesign(parseDocument(text).designs[0]!, { settings });
    expect(result.status).toBe('infeasible');
    expect(result.binding.some((b) => b.startsWith('phase margin'))).toBe(true);
    expect(result.note).toMatch(/best compromise/);
  });

  it('contradictory requirements: a high UGF and a large phase margin through one capacitor', () => {
    // With Rz = 0 the RHP zero gm2/Cc rises as Cc falls while GBW = gm1/Cc rises too (AH ch. 6): a UGF
    // far above what the margin allows cannot have both.
    const text = `design contradictory
  param cc = 1 pF free 0.05 pF .. 20 pF
  stage first   gm = 100 uS  rout = 2 Mohm    cap = 150 fF
  stage second  gm = 400 uS  rout = 200 kohm  cap = 200 fF  inverting
  load cap = 5 pF
  miller first -> second  cc = cc
  require pm  >= 70 deg
  require ugf >= 40 MHz
end
`;
    const result = solveDesign(parseDocument(text).designs[0]!, { settings });
    expect(result.status).toBe('infeasible');
    const failing = result.requirements.filter((r) => !r.met).map((r) => r.kind);
    expect(failing.length).toBeGreaterThan(0);
    expect(failing.every((k) => k === 'pm' || k === 'ugf')).toBe(true);
  });

  it('says so when a design has no free parameters', () => {
    const text = `design fixed
  stage first   gm = 100 uS  rout = 2 Mohm  cap = 150 fF
  load cap = 1 pF
end
`;
    expect(solveDesign(parseDocument(text).designs[0]!, { settings }).status).toBe('no-free-parameters');
  });
});

// Property: every solved fix, applied to the text, clears the finding it was offered for (in every corner).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { TextEditSpec } from '../../../shared/src/checks/types';
import { analyzeDocument } from '../../../shared/src/service';

function apply(text: string, edits: readonly TextEditSpec[]): string {
  const lines = text.split('\n');
  const offset = (p: { line: number; character: number }) =>
    lines.slice(0, p.line).reduce((n, l) => n + l.length + 1, 0) + p.character;
  let out = text;
  for (const e of [...edits].sort((a, b) => offset(b.range.start) - offset(a.range.start)))
    out = out.slice(0, offset(e.range.start)) + e.newText + out.slice(offset(e.range.end));
  return out;
}

// Invented two-stage variants spanning weak and strong second stages, light and heavy loads.
const design = fc
  .record({
    gm1: fc.integer({ min: 50, max: 300 }),
    ratio: fc.double({ min: 2, max: 20, noNaN: true }),
    cc: fc.double({ min: 0.3, max: 4, noNaN: true }),
    cl: fc.double({ min: 0.5, max: 10, noNaN: true }),
    rz: fc.option(fc.integer({ min: 200, max: 20000 }), { nil: undefined }),
    pm: fc.constantFrom(45, 55, 60, 65),
    corner: fc.boolean(),
    viaParam: fc.boolean(),
  })
  .map(
    (p) => `design prop
  param gm1 = ${p.gm1} uS
  param gm2 = ${p.ratio.toPrecision(3)} * gm1
  stage first   gm = gm1  rout = 2 Mohm    cap = 150 fF
  stage second  gm = ${p.viaParam ? 'gm2' : `${(p.gm1 * p.ratio).toPrecision(3)} uS`}  rout = 200 kohm  cap = 200 fF  inverting
  load cap = ${p.cl.toPrecision(3)} pF
  miller first -> second  cc = ${p.cc.toPrecision(3)} pF${p.rz ? `  rz = ${p.rz} ohm` : ''}
  require pm >= ${p.pm} deg
${p.corner ? `  corner slow gm1 = ${Math.round(p.gm1 * 0.8)} uS\n` : ''}end
`,
  );

describe('solved fixes clear their finding', () => {
  it('for random two-stage designs', () => {
    let tried = 0;
    fc.assert(
      fc.property(design, (text) => {
        const report = analyzeDocument(text);
        for (const finding of report.findings) {
          for (const fix of finding.fixes) {
            if (fix.disabled !== undefined) {
              // No value meets the rule: the reason is said, and nothing is edited.
              expect(fix.disabled.length).toBeGreaterThan(10);
              expect(fix.edits).toEqual([]);
              continue;
            }
            tried++;
            const fixed = apply(text, fix.edits);
            // A derived parameter stays the expression the designer wrote.
            expect(fixed).toContain('  param gm2 = ');
            expect(fixed.split('\n').find((l) => l.includes('param gm2'))).toMatch(/\* gm1$/);
            const after = analyzeDocument(fixed);
            expect(after.parsed.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
            expect(
              after.findings.filter((f) => f.code === finding.code).map((f) => f.message),
              `${fix.title} for ${finding.code}`,
            ).toEqual([]);
          }
        }
      }),
      { numRuns: 40 },
    );
    expect(tried).toBeGreaterThan(5);
  });
});

// Invented three-stage nested designs, gm3 derived from a bias current, with a corner.
const nested = fc
  .record({
    gm1: fc.integer({ min: 20, max: 120 }),
    gm2: fc.integer({ min: 100, max: 600 }),
    id3: fc.integer({ min: 100, max: 800 }),
    cc1: fc.double({ min: 0.5, max: 6, noNaN: true }),
    cc2: fc.double({ min: 0.5, max: 6, noNaN: true }),
    cl: fc.integer({ min: 5, max: 150 }),
    gmReq: fc.constantFrom(6, 10, 12),
  })
  .map(
    (p) => `design nested_prop
  param id3 = ${p.id3} uA
  param gm3 = 10 /V * id3
  stage first   gm = ${p.gm1} uS  rout = 1 Mohm    cap = 50 fF
  stage second  gm = ${p.gm2} uS  rout = 500 kohm  cap = 100 fF
  stage third   gm = gm3  rout = 20 V / id3  cap = 300 fF  inverting
  load cap = ${p.cl} pF
  miller first  -> third  cc = ${p.cc1.toPrecision(3)} pF
  miller second -> third  cc = ${p.cc2.toPrecision(3)} pF
  require gainmargin >= ${p.gmReq} dB
  corner weak id3 = ${Math.round(p.id3 * 0.8)} uA
end
`,
  );

describe('solved fixes on nested designs', () => {
  it('clear their own finding in every corner and keep derived values as written', () => {
    let tried = 0;
    fc.assert(
      fc.property(nested, (text) => {
        const report = analyzeDocument(text);
        for (const finding of report.findings) {
          for (const fix of finding.fixes) {
            if (fix.disabled !== undefined) continue;
            tried++;
            const fixed = apply(text, fix.edits);
            // Derived values stay the expressions the designer wrote.
            expect(fixed).toContain('param gm3 = 10 /V * id3');
            expect(fixed).toContain('rout = 20 V / id3');
            const after = analyzeDocument(fixed);
            expect(after.parsed.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
            const same = after.findings.filter(
              (f) =>
                f.code === finding.code &&
                f.severity !== 'info' &&
                f.message.split(' ')[0] === finding.message.split(' ')[0],
            );
            expect(
              same.map((f) => f.message),
              `${fix.title} for ${finding.code}`,
            ).toEqual([]);
          }
        }
      }),
      { numRuns: 12, seed: 7 },
    );
    expect(tried).toBeGreaterThan(3);
  });
});

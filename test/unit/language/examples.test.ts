import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../../shared/src/language';
import { analyzeDocument } from '../../../shared/src/service';

const dir = join(__dirname, '../../../examples');
const files = readdirSync(dir).filter((f) => f.endsWith('.ampnote'));

describe('examples', () => {
  it('there are examples to check', () => {
    expect(files.length).toBeGreaterThanOrEqual(4);
  });

  for (const file of files) {
    it(`${file} parses with no diagnostics and yields every model`, () => {
      const doc = parseDocument(readFileSync(join(dir, file), 'utf8'));
      expect(doc.diagnostics).toEqual([]);
      expect(doc.designs.length).toBeGreaterThan(0);
      for (const d of doc.designs) {
        expect(d.nominal).toBeDefined();
        for (const c of d.corners) expect(c.model?.corner).toBe(c.name);
      }
    });
  }

  it('the RHP-zero example really has its zero within ~3x of the UGF (hand formulas)', () => {
    // UGF ≈ gm1/Cc and the RHP zero = gm2/Cc for a two-stage Miller amplifier without Rz (Allen & Holberg ch. 6, from memory)
    const m = parseDocument(readFileSync(join(dir, 'twoStageRhpZero.ampnote'), 'utf8')).designs[0]!.nominal!;
    const [first, second] = m.stages;
    const cc = m.millers[0]!.cc;
    const ratio = second!.gm / cc / (first!.gm / cc);
    expect(ratio).toBeGreaterThan(2.5);
    expect(ratio).toBeLessThan(4.5);
    expect(m.millers[0]!.rz).toBeUndefined();
  });

  it('the nulling-resistor example moves the zero into the left half-plane (Rz > 1/gm2)', () => {
    // z = 1/(Cc(1/gm2 − Rz)): left half-plane for Rz > 1/gm2 (Gray/Hurst/Lewis/Meyer ch. 9, from memory)
    const m = parseDocument(readFileSync(join(dir, 'twoStageNullingResistor.ampnote'), 'utf8')).designs[0]!
      .nominal!;
    const rz = m.millers[0]!.rz!;
    expect(rz).toBeGreaterThan(1 / m.stages[1]!.gm);
  });
});

describe('the examples behave as their comments say, on the exact analysis', () => {
  const findings = (file: string): string[] =>
    analyzeDocument(readFileSync(join(dir, file), 'utf8'))
      .findings.filter((f) => f.severity !== 'info')
      .map((f) => f.code);

  it('the first attempt misses its phase margin and has its RHP zero too close', () => {
    const codes = findings('twoStageRhpZero.ampnote');
    expect(codes).toContain('phase-margin');
    expect(codes).toContain('rhp-zero');
  });

  it('the nulling resistor fixes it: no error or warning is left', () => {
    expect(findings('twoStageNullingResistor.ampnote')).toEqual([]);
  });

  it('the nested-Miller design meets its requirements in every corner, warning only about its RHP zero', () => {
    expect(findings('threeStageNestedMiller.ampnote')).toEqual(['rhp-zero']);
  });

  it('the element-only ladder meets its DC gain requirement', () => {
    expect(findings('gmDrivenRcLadder.ampnote')).toEqual([]);
  });
});

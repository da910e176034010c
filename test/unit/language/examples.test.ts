import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../../shared/src/language';

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

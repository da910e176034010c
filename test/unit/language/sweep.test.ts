// The `sweep` statement: its model item and its errors at their place. Expected SI values follow from the
// SI prefix definitions (BIPM SI Brochure, 9th ed., table 7) applied to the literals written.
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../../shared/src/language';

const design = (lines: string) => `design d
  param cl = 10 pF
  param n = 3
  stage first  gm = 100 uS rout = 2 Mohm cap = 150 fF
  stage second gm = 1 mS rout = 200 kohm cap = 200 fF inverting
  load cap = cl
  miller first -> second cc = 2 pF
${lines}
end
`;

function parse(lines: string) {
  const doc = parseDocument(design(lines));
  return { doc, model: doc.designs[0]!.nominal!, text: design(lines) };
}
const errorsOf = (lines: string) => parse(lines).doc.diagnostics.filter((d) => d.severity === 'error');
/** The text a diagnostic's range covers (one line). */
function covered(
  text: string,
  d: { range: { start: { line: number; character: number }; end: { character: number } } },
) {
  return text.split('\n')[d.range.start.line]!.slice(d.range.start.character, d.range.end.character);
}

describe('sweep statement', () => {
  it('reads ends, points and scale; log by default over more than a decade', () => {
    const { model, doc } = parse('  sweep cl from 1 pF to 1 nF');
    expect(doc.diagnostics).toEqual([]);
    expect(model.sweeps).toHaveLength(1);
    const s = model.sweeps![0]!;
    expect(s).toMatchObject({ param: 'cl', dimension: 'F', points: 61, scale: 'log' });
    expect(s.low).toBeCloseTo(1e-12, 24);
    expect(s.high).toBeCloseTo(1e-9, 21);
  });

  it('is linear within a decade, or when an end is not above zero, unless `log` is written', () => {
    expect(parse('  sweep cl from 5 pF to 20 pF').model.sweeps![0]!.scale).toBe('linear');
    expect(parse('  sweep n from 0 to 100').model.sweeps![0]!.scale).toBe('linear');
    const s = parse('  sweep cl from 5 pF to 20 pF points 7 log').model.sweeps![0]!;
    expect(s).toMatchObject({ scale: 'log', points: 7 });
  });

  it('keeps several sweeps in text order', () => {
    const { model } = parse('  sweep cl from 1 pF to 1 nF\n  sweep n from 1 to 5 linear');
    expect(model.sweeps!.map((s) => s.param)).toEqual(['cl', 'n']);
  });

  it('reports an unknown parameter at its name, with a suggestion', () => {
    const { text } = parse('  sweep cx from 1 pF to 1 nF');
    const errs = errorsOf('  sweep cx from 1 pF to 1 nF');
    expect(errs).toHaveLength(1);
    expect(covered(text, errs[0]!)).toBe('cx');
    expect(errs[0]!.message).toContain('Unknown parameter `cx`');
    expect(errs[0]!.message).toContain('Did you mean `cl`?');
  });

  it('reports an end of the wrong dimension at that end', () => {
    const lines = '  sweep cl from 1 pF to 1 mA';
    const errs = errorsOf(lines);
    expect(errs).toHaveLength(1);
    expect(covered(parse(lines).text, errs[0]!)).toBe('1 mA');
    expect(errs[0]!.code).toBe('unit');
  });

  it('reports LOW ≥ HIGH over the two ends', () => {
    const lines = '  sweep cl from 1 nF to 1 pF';
    const errs = errorsOf(lines);
    expect(errs).toHaveLength(1);
    expect(covered(parse(lines).text, errs[0]!)).toBe('1 nF to 1 pF');
  });

  it('reports log with an end not above zero at the word', () => {
    const lines = '  sweep n from 0 to 100 log';
    const errs = errorsOf(lines);
    expect(errs).toHaveLength(1);
    expect(covered(parse(lines).text, errs[0]!)).toBe('log');
  });

  it('reports a bad number of points at it', () => {
    const lines = '  sweep cl from 1 pF to 1 nF points 1.5';
    const errs = errorsOf(lines);
    expect(errs).toHaveLength(1);
    expect(covered(parse(lines).text, errs[0]!)).toBe('1.5');
  });

  it('reports a parameter whose dimension has no unit word at its name', () => {
    const lines = '  param k = 2 * 1 uS * 1 pF\n  sweep k from 1 to 2';
    const { text } = parse(lines);
    const errs = errorsOf(lines);
    expect(errs).toHaveLength(1);
    expect(covered(text, errs[0]!)).toBe('k');
    expect(errs[0]!.range.start.line).toBe(8);
  });

  it('reports a missing `to` as a syntax error', () => {
    const errs = errorsOf('  sweep cl from 1 pF 1 nF');
    expect(errs).toHaveLength(1);
    expect(errs[0]!.message).toContain('`to`');
  });

  it('warns on a corner that overrides the swept parameter, and keeps the sweep', () => {
    const lines = '  sweep cl from 1 pF to 1 nF\n  corner heavy cl = 50 pF';
    const { doc, model, text } = parse(lines);
    const warnings = doc.diagnostics.filter((d) => d.severity === 'warning');
    expect(warnings).toHaveLength(1);
    expect(covered(text, warnings[0]!)).toBe('cl');
    expect(warnings[0]!.range.start.line).toBe(8); // the corner line
    expect(warnings[0]!.message).toContain('sweep');
    expect(model.sweeps).toHaveLength(1);
  });
});

describe('sweep and the names of the design', () => {
  it('counts the swept parameter as a reference of it (rename, go to definition)', () => {
    const { doc, text } = parse('  sweep cl from 1 pF to 1 nF');
    const cl = doc.designs[0]!.symbols.find((s) => s.name === 'cl')!;
    const onSweepLine = cl.references.filter((r) => r.start.line === 7);
    expect(onSweepLine).toHaveLength(1);
    expect(covered(text, { range: onSweepLine[0]! })).toBe('cl');
  });
});

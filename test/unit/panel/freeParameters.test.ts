// The panel's free-parameter sliders as plain functions: values written into the design's text and
// analysed again (derived values and corners follow), only moved values edited, in the designer's own
// spelling, and values that cannot be read or analysed refused with the reason.
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../../shared/src/analysis';
import { parseDocument } from '../../../shared/src/language';
import { buildPanelData } from '../../../shared/src/panel/buildPanelData';
import { freePanel } from '../../../shared/src/panel/freeParameters';

// An invented design (values of our own) whose gm and rout follow from free bias currents.
const TEXT = `design sized_from_currents
  param id1 = 5 uA    free 0 .. 40 uA
  param id2 = 50 uA   free 5 uA .. 400 uA
  param cc  = 2 pF    free 0.2 pF .. 10 pF
  param gm2 = 12 /V * id2
  stage first   gm = 16 /V * id1  rout = 8 V / id1   cap = 120 fF  bias = 2 * id1
  stage second  gm = gm2  rout = 5 V / id2   cap = 250 fF  bias = id2  inverting
  load cap = 4 pF
  miller first -> second  cc = cc
  require ugf >= 2 MHz
  require pm  >= 60 deg
  corner heavy  load.cap = 6 pF
end
`;
const source = parseDocument(TEXT).designs[0]!;
const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b), 1e-300);

/** The design's text with one parameter's literal replaced by hand, as the designer would edit it. */
function editedByHand(name: string, literal: string) {
  const text = TEXT.replace(new RegExp(`(param ${name}\\s*=\\s*)[\\d.]+ \\w+`), `$1${literal}`);
  expect(text).not.toBe(TEXT);
  return parseDocument(text).designs[0]!;
}

describe('free-parameter sliders', () => {
  it('list every free parameter with its bounds; log scale only between positive bounds', () => {
    const p = freePanel(source)!;
    // The bounds as the text above writes them.
    expect(p.free.sliders.map((s) => [s.name, s.low, s.high, s.log, s.unit])).toEqual([
      ['id1', 0, 40e-6, false, 'A'],
      ['id2', 5e-6, 400e-6, true, 'A'],
      ['cc', 0.2e-12, 10e-12, true, 'F'],
    ]);
    expect(p.free.edits).toEqual([]);
    expect(p.free.refused).toBeUndefined();
  });

  it('writes a value into the text: derived values and corners follow, as a hand edit of the text', () => {
    const p = freePanel(source, { id2: 95e-6, unknown: 3 })!;
    expect(p.free.refused).toBeUndefined();
    // Only the moved value is edited, in the file's own unit spelling.
    expect(p.free.edits.map((e) => [e.range.start.line, e.newText])).toEqual([[2, '95 uA']]);
    const hand = editedByHand('id2', '95 uA');
    // gm2 = 12 /V * id2, as the text derives it.
    expect(rel(p.model.stages[1]!.gm, 12 * 95e-6)).toBeLessThan(1e-12);
    expect(p.model.stages.map((s) => s.gm)).toEqual(hand.nominal!.stages.map((s) => s.gm));
    const runs = [hand.nominal!, hand.corners[0]!.model!].map((m) => analyzeDesign(m));
    const worstPm = Math.min(...runs.map((a) => a.loop.phaseMarginDeg!));
    const pm = p.free.requirements.find((r) => r.label === 'phase margin')!;
    expect(pm.met).toBe(worstPm >= 60);
    expect(rel(Number(/[\d.]+/.exec(pm.worst.text)![0]), worstPm)).toBeLessThan(5e-3);
    // The objective: the stages' bias currents, 2 · 5 uA + 95 uA as written above.
    expect(rel(p.free.objective.value, 105e-6)).toBeLessThan(1e-12);
  });

  it('refuses a value outside its bounds, and one the design cannot be analysed with, with the reason', () => {
    const outside = freePanel(source, { cc: 20e-12 })!;
    expect(outside.free.refused).toMatch(/cc = 20 pF lies outside its bounds 200 fF \.\. 10 pF/);
    expect(outside.free.sliders.map((s) => s.value)).toEqual([5e-6, 50e-6, 2e-12]);
    expect(outside.free.edits).toEqual([]);
    // id1 = 0 is within its bounds, but the first stage's gm = 16 /V * id1 is then zero.
    const zero = freePanel(source, { id1: 0 })!;
    expect(zero.free.refused).toMatch(/with these values the design does not read: .*`gm` of zero/);
    expect(zero.free.sliders[0]!.value).toBe(5e-6);
    expect(freePanel(source, { id2: Number.NaN })!.free.refused).toMatch(/not a finite number/);
  });

  it('puts them in the panel data; a design without free parameters has none', () => {
    const data = buildPanelData(source.nominal!, 'file:///x', { source, free: { cc: 3e-12 } })!;
    expect(data.free!.sliders[2]!.value).toBe(3e-12);
    // The charts draw the edited design: the locus is swept around the slider's Cc.
    expect(data.cc).toBe(3e-12);
    const plain = parseDocument(TEXT.replace(/ free [^\n]*/g, '')).designs[0]!;
    expect(buildPanelData(plain.nominal!, 'file:///x', { source: plain })!.free).toBeUndefined();
  });
});

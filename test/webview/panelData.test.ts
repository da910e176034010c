// buildPanelData on its own: the sweep it asks for, slider overrides, cancellation, and the nulling-resistor
// zero against its closed form.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../shared/src/language';
import { analyzeDesign, withValue } from '../../shared/src/analysis';
import type { DesignModel } from '../../shared/src/language/model';
import {
  buildPanelData,
  compensationAt,
  sweepValues,
  SWEEP_SPAN,
} from '../../shared/src/panel/buildPanelData';
import { ROOT } from './harness';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b), 1e-300);

function example(file: string): DesignModel {
  const doc = parseDocument(readFileSync(join(ROOT, 'examples', file), 'utf8'));
  const model = doc.designs[0]?.nominal;
  if (!model) throw new Error(`${file} has no evaluated design`);
  return model;
}

describe('sweep values', () => {
  it('hold 0, the written and the shown value exactly, sorted, spanning the written value both ways', () => {
    const v = sweepValues(1e-12, 3.3e-12, 15);
    expect(v[0]).toBe(0);
    expect(v).toContain(1e-12);
    expect(v).toContain(3.3e-12);
    expect([...v].sort((a, b) => a - b)).toEqual(v);
    expect(new Set(v).size).toBe(v.length);
    expect(v[1]).toBeCloseTo(1e-12 / SWEEP_SPAN, 25);
    expect(v[v.length - 1]).toBeCloseTo(1e-12 * SWEEP_SPAN, 19);
  });
});

describe('panel data', () => {
  it('puts the Cc = 0 point of the locus where the engine puts the uncompensated design', () => {
    for (const file of [
      'twoStageRhpZero.ampnote',
      'twoStageNullingResistor.ampnote',
      'threeStageNestedMiller.ampnote',
    ]) {
      const model = example(file);
      const data = buildPanelData(model, 'file:///x')!;
      const uncompensated = analyzeDesign(withValue(model, { kind: 'miller', index: 0, field: 'cc' }, 0))
        .poles.map((p) => p.hz)
        .sort((a, b) => a - b);
      const atZero = data.locus.poles.filter((s) => s.cc[0] === 0).map((s) => s.hz[0]!);
      expect(atZero.length).toBe(uncompensated.length);
      atZero.forEach((hz, k) => expect(rel(hz, uncompensated[k]!)).toBeLessThan(1e-9));
    }
  });

  it('moves the zero with the Rz slider as 1/(Cc·(1/gm2 − Rz)) and drops the Rz pole at Rz = 0', () => {
    // Zero of the two-stage Miller with a series nulling resistor (Gray/Hurst/Lewis/Meyer ch. 9 and
    // Allen/Holberg ch. 6, from memory, re-derived): z = 1/(Cc·(1/gm2 − Rz)), right half-plane for Rz < 1/gm2.
    const model = example('twoStageNullingResistor.ampnote');
    const gm2 = model.stages[1]!.gm;
    const cc = model.millers[0]!.cc;
    for (const rz of [1e3, 2e3, 8e3, 20e3]) {
      const data = buildPanelData(model, 'file:///x', { rz })!;
      expect(data.rz).toBe(rz);
      const expected = 1 / (cc * (1 / gm2 - rz));
      const zero = data.zeros.find((z) => Math.abs(z.s.im) === 0 && rel(z.s.re, expected) < 1e-6);
      expect(zero, `zero near ${expected} rad/s for Rz = ${rz}`).toBeDefined();
      expect(zero!.rhp).toBe(rz < 1 / gm2);
    }
    const written = buildPanelData(model, 'file:///x')!;
    const none = buildPanelData(model, 'file:///x', { rz: 0 })!;
    expect(none.rz).toBe(0);
    expect(none.poles.length).toBe(written.poles.length - 1);
    // Without Rz the zero returns to +gm2/Cc (same sources).
    expect(none.zeros.some((z) => z.rhp && rel(z.s.re, gm2 / cc) < 1e-6)).toBe(true);
  });

  it('reports the shown Cc, keeps the written one, and stays finite for extreme slider values', () => {
    const model = example('twoStageRhpZero.ampnote');
    for (const cc of [1e-17, 1e-15, 1e-9]) {
      const data = buildPanelData(model, 'file:///x', { cc })!;
      expect(data.cc).toBe(cc);
      expect(data.compensation!.ccWritten).toBe(model.millers[0]!.cc);
      expect(data.poles.every((p) => Number.isFinite(p.hz))).toBe(true);
      expect(data.bode.magDb.every(Number.isFinite)).toBe(true);
      expect(data.locus.poles.some((s) => s.cc.includes(cc))).toBe(true);
    }
  });

  it('sweeps the element asked for, lists every element, and falls back to the first', () => {
    const model = example('threeStageNestedMiller.ampnote');
    const inner = { kind: 'miller', index: 1 } as const;
    const data = buildPanelData(model, 'file:///x', { compensation: inner })!;
    expect(data.compensationChoices!.map((c) => [c.kind, c.index, c.label])).toEqual([
      ['miller', 0, 'miller first -> third'],
      ['miller', 1, 'miller second -> third'],
    ]);
    expect(data.compensation).toMatchObject({ ...inner, ccWritten: model.millers[1]!.cc });
    // Its Cc = 0 end is the design without the inner capacitor, the outer one as written.
    const without = analyzeDesign(withValue(model, { ...inner, field: 'cc' }, 0))
      .poles.map((p) => p.hz)
      .sort((a, b) => a - b);
    const atZero = data.locus.poles.filter((s) => s.cc[0] === 0).map((s) => s.hz[0]!);
    expect(atZero.length).toBe(without.length);
    atZero.forEach((hz, k) => expect(rel(hz, without[k]!)).toBeLessThan(1e-9));
    // A slider value moves that element only.
    const moved = buildPanelData(model, 'file:///x', { compensation: inner, cc: 6e-12 })!;
    const exact = analyzeDesign(withValue(model, { ...inner, field: 'cc' }, 6e-12)).poles.map((p) => p.hz);
    expect(moved.poles.map((p) => p.hz)).toEqual(exact);
    // An element the design does not have: the first Miller capacitor, as without a choice.
    for (const compensation of [
      { kind: 'miller', index: 5 },
      { kind: 'buffered', index: 0 },
    ] as const)
      expect(buildPanelData(model, 'file:///x', { compensation })!.compensation).toMatchObject({
        kind: 'miller',
        index: 0,
      });
    // The cursor on a Miller line picks it; on any other line nothing.
    const line = model.millers[1]!.origin.range.start.line;
    expect(compensationAt(model, { line, character: 0 })).toEqual(inner);
    expect(compensationAt(model, { line: model.millers[0]!.origin.range.start.line, character: 3 })).toEqual({
      kind: 'miller',
      index: 0,
    });
    expect(
      compensationAt(model, { line: model.stages[0]!.origin.range.start.line, character: 0 }),
    ).toBeUndefined();
  });

  it('returns nothing once cancelled', () => {
    const model = example('threeStageNestedMiller.ampnote');
    expect(buildPanelData(model, 'file:///x', { token: { isCancellationRequested: true } })).toBeUndefined();
    let checks = 0;
    const late = {
      get isCancellationRequested() {
        return ++checks > 1;
      },
    };
    expect(buildPanelData(model, 'file:///x', { token: late })).toBeUndefined();
  });

  it('sets the settling band from the design’s requirement, else from the setting', () => {
    const stated = example('twoStageNullingResistor.ampnote');
    expect(buildPanelData(stated, 'file:///x', { settleTolerance: 0.05 })!.step.tolerance).toBe(0.001);
    const unstated = example('twoStageRhpZero.ampnote');
    expect(buildPanelData(unstated, 'file:///x', { settleTolerance: 0.05 })!.step.tolerance).toBe(0.05);
  });
});

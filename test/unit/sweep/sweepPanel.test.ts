// The panel's sweep data against independent single analyses: each value drawn is the ordinary analysis
// of the design with that value written into its text, the locus tracks pass through those analyses'
// roots, and the shaded stretches are the ones the sweep's findings name.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../../shared/src/language';
import { analyzeDocument } from '../../../shared/src/service';
import { panelSweeps } from '../../../shared/src/panel/sweepPanel';
import { writeValue } from '../../../shared/src/sweep/sweepDesign';

const text = readFileSync('examples/twoStageLoadSweep.ampnote', 'utf8');
const withCl = (v: number) => text.replace('param cl  = 10 pF', `param cl  = ${writeValue(v, 'F')}`);

describe('panelSweeps', () => {
  const source = parseDocument(text).designs[0]!;
  const sw = panelSweeps(source)![0]!;

  it('draws, per corner and value, the margins of a single analysis of the text at that value', () => {
    expect(sw.param).toBe('cl');
    expect(sw.values).toHaveLength(61);
    expect(sw.corners.map((c) => c.corner)).toEqual(['nominal', 'slow']);
    for (const i of [0, 17, 30, 44, 60]) {
      const single = analyzeDocument(withCl(sw.values[i]!)).designs[0]!;
      single.runs.forEach((run, c) => {
        const loop = run.analysis.loop;
        expect(sw.corners[c]!.phaseMarginDeg[i]).toBe(loop.phaseMarginDeg ?? null);
        expect(sw.corners[c]!.ugfHz[i]).toBe(loop.ugfHz ?? null);
        expect(sw.corners[c]!.gainMarginDb[i]).toBe(loop.gainMarginDb ?? null);
      });
    }
  });

  it('follows each nominal pole through the roots of the single analyses', () => {
    const poles = sw.locus.filter((t) => t.kind === 'pole');
    for (const i of [0, 30, 60]) {
      const single = analyzeDocument(withCl(sw.values[i]!)).designs[0]!.runs[0]!.analysis;
      const at = poles.flatMap((t) => t.s.filter((_, k) => t.values[k] === sw.values[i]));
      expect(new Set(at.map((s) => `${s.re},${s.im}`))).toEqual(
        new Set(single.poles.map((p) => `${p.s.re},${p.s.im}`)),
      );
    }
    // A track moves continuously: between neighbouring values a root moves less than it is far from 0.
    for (const t of poles)
      for (let k = 1; k < t.s.length; k++) {
        const a = t.s[k - 1]!;
        const b = t.s[k]!;
        expect(Math.hypot(a.re - b.re, a.im - b.im)).toBeLessThan(
          Math.max(Math.hypot(a.re, a.im), Math.hypot(b.re, b.im)),
        );
      }
  });

  it('shades the stretch the sweep finding names, with the requirement drawn at its written value', () => {
    const finding = analyzeDocument(text).findings.find(
      (f) => f.code === 'sweep' && /phase margin/.test(f.message),
    )!;
    expect(finding).toBeDefined();
    const pm = sw.failing.filter((f) => f.label.startsWith('PM'));
    expect(pm).toHaveLength(1);
    // The finding's text names the same edges (to its three significant digits).
    const edges = /from ([\d.]+ [pn]F) to ([\d.]+ [pn]F)/.exec(finding.message)!;
    const parse = (s: string) => Number(s.split(' ')[0]) * (s.endsWith('nF') ? 1e-9 : 1e-12);
    expect(pm[0]!.from / parse(edges[1]!)).toBeCloseTo(1, 2);
    expect(pm[0]!.to / parse(edges[2]!)).toBeCloseTo(1, 2);
    expect(sw.requirements.find((r) => r.quantity === 'phaseMarginDeg')).toMatchObject({
      op: '>=',
      value: 50,
    });
  });
});

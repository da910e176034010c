// Fixes on real designs through the facade: solved on the exact model, 3 significant digits, re-checked,
// editing only the value they name; applying one clears its finding.
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeDesign, withValue } from '../../../shared/src/analysis';
import type { Finding, TextEditSpec } from '../../../shared/src/checks/types';
import { parseDocument } from '../../../shared/src/language';
import {
  analyzeDocument,
  analyzeDocumentSteps,
  compensationEdits,
  createAnalysisCache,
  designNamed,
} from '../../../shared/src/service';

const ROOT = resolve(__dirname, '../../..');
const RHP = readFileSync(resolve(ROOT, 'examples/twoStageRhpZero.ampnote'), 'utf8');

function apply(text: string, edits: readonly TextEditSpec[]): string {
  const lines = text.split('\n');
  const offset = (p: { line: number; character: number }) =>
    lines.slice(0, p.line).reduce((n, l) => n + l.length + 1, 0) + p.character;
  let out = text;
  for (const e of [...edits].sort((a, b) => offset(b.range.start) - offset(a.range.start)))
    out = out.slice(0, offset(e.range.start)) + e.newText + out.slice(offset(e.range.end));
  return out;
}

const find = (fs: readonly Finding[], code: string) => fs.find((f) => f.code === code)!;
const fixTitled = (f: Finding, part: string) => f.fixes.find((x) => x.title.includes(part))!;

describe('quick fixes on the exact model', () => {
  const report = analyzeDocument(RHP);

  it('moves the zero to infinity with rz = 1/gm2', () => {
    // Zero at 1/(Cc(1/gm2 − Rz)) goes to infinity at Rz = 1/gm2 (GHLM ch. 9, AH ch. 6; from memory):
    // 1/350 µS = 2857 ohm → 2.86 kohm at 3 significant digits.
    const fix = fixTitled(find(report.findings, 'rhp-zero'), 'moves the zero to infinity');
    expect(fix.title).toBe('Add rz = 2.86 kohm (moves the zero to infinity)');
    expect(fix.preferred).toBe(true);
    const model = report.designs[0]!.source.nominal!;
    expect(fix.edits).toEqual([
      {
        range: { start: model.millers[0]!.origin.insertAt, end: model.millers[0]!.origin.insertAt },
        newText: ' rz = 2.86 kohm',
      },
    ]);
    const after = analyzeDocument(apply(RHP, fix.edits));
    expect(after.findings.map((f) => f.code)).not.toContain('rhp-zero');
    expect(after.parsed.diagnostics).toEqual([]);
  });

  it('solves Cc for the required phase margin: the rounded value meets it, one step less does not', () => {
    const finding = find(report.findings, 'phase-margin');
    const fix = fixTitled(finding, 'Set cc');
    const m = /Set cc = ([\d.]+) pF/.exec(fix.title)!;
    const cc = Number(m[1]) * 1e-12;
    expect(Number(Number(m[1]).toPrecision(3))).toBe(Number(m[1])); // 3 significant digits at most
    const model = report.designs[0]!.source.nominal!;
    const target = { kind: 'miller', index: 0, field: 'cc' } as const;
    expect(analyzeDesign(withValue(model, target, cc)).loop.phaseMarginDeg!).toBeGreaterThanOrEqual(60);
    const step = 10 ** (Math.floor(Math.log10(cc)) - 2);
    expect(analyzeDesign(withValue(model, target, cc - 2 * step)).loop.phaseMarginDeg!).toBeLessThan(60);
    // The edit replaces only the written value `1 pF`.
    expect(fix.edits).toEqual([
      { range: model.millers[0]!.origin.fields['cc']!.range, newText: `${m[1]} pF` },
    ]);
    expect(analyzeDocument(apply(RHP, fix.edits)).findings.map((f) => f.code)).not.toContain('phase-margin');
  });

  it('raises gm2 through its parameter, keeping the rest of the line', () => {
    const fix = fixTitled(find(report.findings, 'gm-ratio'), 'Raise gm');
    // gm2 ≥ 10·gm1 = 1 mS (AH ch. 6, common practice), and no less than the exact zero placement asks.
    expect(fix.title).toMatch(/to (1|[1-9]\.\d+) mS/);
    const model = report.designs[0]!.source.nominal!;
    const gm2 = model.params.find((p) => p.name === 'gm2')!;
    expect(fix.edits).toHaveLength(1);
    expect(fix.edits[0]!.range).toEqual(gm2.origin.fields['value']!.range);
    const fixed = apply(RHP, fix.edits);
    expect(fixed.split('\n')[15]).toBe(RHP.split('\n')[15]); // the stage line is untouched
    const codes = analyzeDocument(fixed).findings.map((f) => f.code);
    expect(codes).not.toContain('gm-ratio');
  });

  it('calms peaking with a Cc solved for more phase margin', () => {
    const finding = find(report.findings, 'complex-poles');
    const fix = fixTitled(finding, 'Set cc');
    expect(fix.title).toMatch(/phase margin: calmer poles/);
    const after = analyzeDocument(apply(RHP, fix.edits));
    expect(after.findings.map((f) => f.code)).not.toContain('complex-poles');
    expect(after.designs[0]!.runs[0]!.analysis.loop.peakingDb).toBeLessThanOrEqual(1);
  });

  it('offers no fix that a corner overriding the same value would undo', () => {
    const text = RHP.replace('end\n', '  corner weak gm2 = 300 uS\nend\n');
    const ratio = find(analyzeDocument(text).findings, 'gm-ratio');
    expect(ratio.corners).toBeUndefined(); // it holds in both runs
    const titles = ratio.fixes.map((f) => f.title);
    expect(titles.some((t) => t.startsWith('Raise gm'))).toBe(false);
    const rz = fixTitled(ratio, 'Add rz');
    const fixed = analyzeDocument(apply(text, rz.edits));
    expect(fixed.findings.map((f) => f.code)).not.toContain('gm-ratio');
  });

  it('offers to state a missing requirement with its default', () => {
    const text = RHP.replace('  require pm     >= 60 deg\n', '');
    const pm = find(analyzeDocument(text).findings, 'phase-margin');
    const add = fixTitled(pm, 'Add `require pm >= 60 deg`');
    const fixed = apply(text, add.edits);
    expect(fixed).toContain('  require pm >= 60 deg\n');
    const reparsed = parseDocument(fixed);
    expect(reparsed.diagnostics).toEqual([]);
    expect(reparsed.designs[0]!.nominal!.requirements.some((r) => r.kind === 'pm' && r.value === 60)).toBe(
      true,
    );
  });

  it('writes panel values into the swept capacitor, and rz = 0 removes the resistor', () => {
    const withRz = readFileSync(resolve(ROOT, 'examples/twoStageNullingResistor.ampnote'), 'utf8');
    const design = analyzeDocument(withRz).designs[0]!;
    const edits = compensationEdits(design, 1.5e-12, 0);
    const fixed = apply(withRz, edits);
    expect(fixed).toContain('miller first -> second  cc = 1.5 pF\n');
    expect(parseDocument(fixed).designs[0]!.nominal!.millers[0]!.rz).toBeUndefined();
  });
});

describe('analysis cache', () => {
  const two = RHP + '\n' + RHP.replace('design bridge_readout', 'design bridge_readout_b');

  it('re-analyses only the design whose text changed, and moved designs match a fresh analysis', () => {
    const cache = createAnalysisCache();
    const first = analyzeDocument(two, undefined, undefined, cache);
    const edited = two.replace('design bridge_readout\n', 'design bridge_readout\n  # a note\n');
    const second = analyzeDocument(edited, undefined, undefined, cache);
    const b1 = designNamed(first, 'bridge_readout_b')!;
    const b2 = designNamed(second, 'bridge_readout_b')!;
    expect(b2.runs[0]!.analysis).toBe(b1.runs[0]!.analysis); // reused, not recomputed
    expect(designNamed(second, 'bridge_readout')!.runs[0]!.analysis).not.toBe(
      designNamed(first, 'bridge_readout')!.runs[0]!.analysis,
    );
    const fresh = analyzeDocument(edited);
    const strip = (fs: readonly Finding[]) =>
      fs.map((f) => ({ ...f, fixes: f.fixes.map((x) => ({ ...x })) }));
    expect(strip(second.findings)).toEqual(strip(fresh.findings));
    expect(second.parsed).toEqual(fresh.parsed);
  });

  it('does not judge a design with a language error, and still judges the others', () => {
    const broken = two.replace(
      'stage first   gm = gm1  rout = 2 Mohm',
      'stage first   gm = gm1  rout = 0 ohm',
    );
    const report = analyzeDocument(broken);
    expect(report.parsed.diagnostics.length).toBeGreaterThan(0);
    expect(designNamed(report, 'bridge_readout')!.findings).toEqual([]);
    expect(designNamed(report, 'bridge_readout_b')!.findings.map((f) => f.code)).toContain('rhp-zero');
  });

  it('keeps every live design when two passes over the same text interleave', () => {
    const cache = createAnalysisCache();
    const steps = analyzeDocumentSteps(two, undefined, undefined, cache);
    steps.next(); // the first design is done
    analyzeDocument(two, undefined, undefined, cache); // a whole pass in between (a hover)
    while (!steps.next().done);
    expect(cache.size).toBe(2);
  });

  it('a cancelled analysis says so and caches nothing', () => {
    const cache = createAnalysisCache();
    const report = analyzeDocument(two, undefined, { isCancellationRequested: true }, cache);
    expect(report.cancelled).toBe(true);
    expect(report.designs).toEqual([]);
    expect(cache.size).toBe(0);
  });
});

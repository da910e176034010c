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

  it('never rewrites a derived gm2 as a number, and says why no gm fix exists', () => {
    // gm2 = 3.5 * gm1: its only literal input is gm1, and raising gm1 raises gm2 in the same ratio, so no
    // value meets gm2 ≥ 10·gm1 (common practice, AH ch. 6): the fix is shown disabled with the reason.
    const finding = find(report.findings, 'gm-ratio');
    const disabled = finding.fixes.find((x) => x.disabled !== undefined)!;
    expect(disabled.edits).toEqual([]);
    expect(disabled.disabled).toMatch(/no value of gm1 from .* meets it/);
    for (const fix of finding.fixes)
      for (const e of fix.edits) expect(apply(RHP, [e])).toContain('param gm2 = 3.5 * gm1');
  });

  it('changes the input of a derived gm, so the bias and rout derived from it follow', () => {
    // gm = 2·Id/Vov (square-law, Razavi ch. 2) and rout = VA/Id: raising id2 raises gm2 and lowers rout2
    // together; the fix edits id2 and leaves both expressions as written.
    const text = `design derived
  param id2 = 50 uA
  param vov2 = 200 mV
  param gm2 = 2 * id2 / vov2
  stage first   gm = 100 uS  rout = 2 Mohm  cap = 150 fF
  stage second  gm = gm2  rout = 20 V / id2  cap = 200 fF  bias = id2  inverting
  load cap = 1 pF
  miller first -> second  cc = 1 pF
end
`;
    const found = analyzeDocument(text).findings;
    const ratio = find(found, 'gm-ratio');
    const fix = fixTitled(ratio, 'Set id2');
    expect(fix.edits).toHaveLength(1);
    const fixed = apply(text, fix.edits);
    expect(fixed).toContain('param gm2 = 2 * id2 / vov2');
    expect(fixed).toContain('rout = 20 V / id2');
    // gm2 ≥ 10 × gm1 = 1 mS (common practice) needs id2 ≥ gm2·Vov/2 = 100 µA (square law, Razavi ch. 2).
    const id2 = parseDocument(fixed).designs[0]!.nominal!.params.find((p) => p.name === 'id2')!.value;
    expect(id2).toBeGreaterThanOrEqual(100e-6 * (1 - 1e-9));
    expect(id2).toBeLessThan(101e-6);
    expect(analyzeDocument(fixed).findings.map((f) => f.code)).not.toContain('gm-ratio');
  });

  it('calms peaking with a Cc solved on the peaking itself', () => {
    const finding = find(report.findings, 'complex-poles');
    const fix = fixTitled(finding, 'Set cc');
    // The title reports the rule's own quantity after the edit: peaking at or below the 1 dB limit.
    expect(fix.title).toMatch(/peaking (0\.\d|1\.0) dB/);
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

  it('offers no fix that only states a requirement: a fix changes the design', () => {
    const text = RHP.replace('  require pm     >= 60 deg\n', '');
    const findings = analyzeDocument(text).findings;
    for (const f of findings) for (const fix of f.fixes) expect(fix.title).not.toMatch(/^Add `require/);
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

// The server's feature functions in process, on designs written inline with a `|` cursor marker.
import { describe, expect, it } from 'vitest';
import { TextDocument } from 'vscode-languageserver-textdocument';
import { analyzeDesign } from '../../shared/src/analysis';
import { formatDb, formatHz } from '../../shared/src/format/si';
import { analyzeDocument } from '../../shared/src/service';
import { KEYWORDS, RESERVED_NAMES } from '../../shared/src/language';
import { codeActions } from '../../server/src/features/codeActions';
import { codeLenses } from '../../server/src/features/codeLens';
import { completion } from '../../server/src/features/completion';
import { definition } from '../../server/src/features/definition';
import { hover } from '../../server/src/features/hover';
import { inlayHints } from '../../server/src/features/inlayHints';
import { prepareRename, rename } from '../../server/src/features/rename';
import { documentSymbols } from '../../server/src/features/symbols';
import { applyEdits } from './lspClient';
import { withLazyFixes } from '../../shared/src/checks/acrossRuns';
import { rangesMeet } from '../../server/src/convert';
import { CancellationToken } from 'vscode-languageserver';

const NEVER = CancellationToken.None;

/** Split `text` at its `|` marker: the text without it and the marker's position. */
function cursor(marked: string) {
  const at = marked.indexOf('|');
  const text = marked.slice(0, at) + marked.slice(at + 1);
  const before = text.slice(0, at).split('\n');
  const position = { line: before.length - 1, character: before[before.length - 1]!.length };
  return {
    text,
    position,
    report: analyzeDocument(text),
    document: TextDocument.create('file:///t.ampnote', 'ampnote', 1, text),
  };
}

// An invented two-stage design (demo values).
const DESIGN = (body: string) => `design demo
  param gm1 = 120 uS
  stage first   gm = gm1     rout = 1.5 Mohm  cap = 100 fF
  stage second  gm = 1.5 mS  rout = 150 kohm  cap = 250 fF  inverting
  load cap = 2 pF
  miller first -> second  cc = 1.2 pF   # compensation
  require pm >= 60 deg
  require ugf >= 5 MHz
${body}end
`;

const hoverText = (marked: string) => {
  const c = cursor(marked);
  const h = hover(c.report, c.position);
  return { ...c, value: h ? (h.contents as { value: string }).value : '' };
};

describe('hover', () => {
  it('a stage: its values and the poles it takes part in, with shares', () => {
    const { value, report } = hoverText(DESIGN('').replace('stage second', 'stage sec|ond'));
    expect(value).toContain('**stage second** (inverting, input first)');
    expect(value).toContain('gm = 1.5 mS, rout = 150 kohm, cap = 250 fF');
    const poles = analyzeDesign(report.designs[0]!.source.nominal!).poles;
    const second = poles.filter((p) => p.participation.some((x) => x.node === 'second' && x.share >= 0.01));
    expect(second.length).toBeGreaterThan(0);
    for (const p of second) expect(value).toContain(formatHz(p.hz));
    expect(value).toMatch(/second \d+ %/);
    expect(value).toContain('Hand estimate vs exact');
  });

  it('a parameter from one of its uses', () => {
    const { value } = hoverText(DESIGN('').replace('gm = gm1 ', 'gm = g|m1 '));
    expect(value).toContain('**param gm1** = 120 uS');
    expect(value).toContain('Used 1 time.');
  });

  it('a requirement: measured, required, pass or fail', () => {
    const { value, report } = hoverText(DESIGN('').replace('require pm', 'req|uire pm'));
    const pm = report.designs[0]!.runs[0]!.analysis.loop.phaseMarginDeg!;
    expect(value).toContain('**requirement: phase margin** ≥ 60.0°');
    expect(value).toContain(`Measured: ${pm.toFixed(1)}° — ${pm >= 60 ? 'pass' : 'FAIL'}`);
  });

  it('a design: "nominal and N corners", an unbounded gain margin in words, a requirement\'s headroom', () => {
    // One stage (invented values): a single pole, so the loop phase never reaches −180° and the gain margin
    // has no bound (first-order loop: phase ≥ −90°, textbook single-pole response).
    const ONE_STAGE = `design one
  stage first gm = 100 uS rout = 1 Mohm cap = 1 pF
  require pm >= 60 deg
  corner slow first.gm = 80 uS
end
`;
    const design = hoverText(ONE_STAGE.replace('design one', 'design o|ne')).value;
    expect(design).toMatch(/gain margin unbounded,/);
    expect(design).toContain('Worst over nominal and 1 corner: ');
    expect(design).not.toMatch(/\bruns\b/);
    const { value, report } = hoverText(ONE_STAGE.replace('require pm', 'req|uire pm'));
    const pm = report.designs[0]!.runs[0]!.analysis.loop.phaseMarginDeg!;
    expect(value).toContain(`(headroom +${(pm - 60).toFixed(1)}°)`);
    expect(value).not.toContain('margin +');
    // A loop whose phase does reach −180° prints its gain margin as a number (the analysis' own value).
    const two = hoverText(DESIGN('').replace('design demo', 'design de|mo'));
    const gm = two.report.designs[0]!.runs[0]!.analysis.loop.gainMarginDb;
    expect(two.value).toContain(`gain margin ${gm === undefined ? 'unbounded' : formatDb(gm)},`);
  });

  it('nothing on a blank line or outside any design', () => {
    expect(hoverText(DESIGN('\n|\n')).value).toBe('');
    expect(hoverText('# notes|\n' + DESIGN('')).value).toBe('');
  });
});

describe('completion', () => {
  const labels = (marked: string) => {
    const c = cursor(marked);
    return completion(c.report, c.document, c.position).map((i) => i.label);
  };
  it('statement keywords at the start of a line', () => {
    expect(labels(DESIGN('  |\n'))).toEqual(
      expect.arrayContaining(['stage', 'miller', 'require', 'corner', 'end']),
    );
  });
  it('requirement kinds after `require`', () => {
    expect(labels(DESIGN('  require |\n'))).toEqual(
      expect.arrayContaining(['ugf', 'pm', 'gainmargin', 'slew', 'settle']),
    );
  });
  it('units after a number', () => {
    expect(labels(DESIGN('').replace('cc = 1.2 pF', 'cc = 1.2 |'))).toEqual(
      expect.arrayContaining(['pF', 'fF', 'nF']),
    );
  });
  it("lists the field's own units first", () => {
    const c = cursor(DESIGN('').replace('cc = 1.2 pF', 'cc = 1.2 |'));
    const items = completion(c.report, c.document, c.position).sort((a, b) =>
      a.sortText! < b.sortText! ? -1 : 1,
    );
    expect(items[0]!.label).toMatch(/F$/);
    expect(items.findIndex((i) => i.label === 'pF')).toBeLessThan(items.findIndex((i) => i.label === 'kohm'));
  });
  it('no units after a name that ends in a digit', () => {
    expect(labels(DESIGN('').replace('gm = gm1 ', 'gm = gm1 |'))).not.toContain('pF');
    expect(labels(DESIGN('').replace('cc = 1.2 pF', 'cc = 2.5e-1|'))).toContain('pF');
  });
  it('fields not yet written and names in scope inside a statement', () => {
    const got = labels(DESIGN('').replace('cc = 1.2 pF', 'cc = 1.2 pF |'));
    expect(got).toContain('rz');
    expect(got).not.toContain('cc');
    expect(got).toEqual(expect.arrayContaining(['gm1', 'first', 'second']));
  });
});

describe('names', () => {
  it('goes to the declaration and renames every use', () => {
    const c = cursor(DESIGN('').replace('gm = gm1 ', 'gm = gm|1 '));
    const def = definition(c.report, 'u', c.position)!;
    expect(def.range.start).toEqual({ line: 1, character: 8 });
    expect(prepareRename(c.report, c.position)!.placeholder).toBe('gm1');
    const edit = rename(c.report, 'u', c.position, 'gm_a')!;
    expect(edit.changes!['u']!.map((e) => e.range.start.line).sort()).toEqual([1, 2]);
    expect(() => rename(c.report, 'u', c.position, '2x')).toThrow(/not a name/);
    expect(() => rename(c.report, 'u', c.position, 'stage')).toThrow(/word of the language/);
  });
  it('renames a stage everywhere its node is named, and the design reads the same', () => {
    const c = cursor(DESIGN('  corner slow second.gm = 1.2 mS\n').replace('stage second', 'stage sec|ond'));
    const edit = rename(c.report, 'u', c.position, 'driver')!;
    const lines = new Set(edit.changes!['u']!.map((e) => e.range.start.line));
    expect([...lines].sort()).toEqual([3, 5, 8]); // the stage, the Miller line, the corner override
    const renamed = applyEdits(c.text, edit.changes!['u']!);
    expect(renamed).not.toMatch(/\bsecond\b/);
    const after = analyzeDocument(renamed);
    expect(after.parsed.diagnostics).toEqual([]);
    expect(after.designs[0]!.runs.map((r) => r.analysis.loop.phaseMarginDeg)).toEqual(
      c.report.designs[0]!.runs.map((r) => r.analysis.loop.phaseMarginDeg),
    );
  });

  it('refuses exactly the names a declaration refuses', () => {
    const c = cursor(DESIGN('').replace('gm = gm1 ', 'gm = gm|1 '));
    for (const word of RESERVED_NAMES)
      expect(() => rename(c.report, 'u', c.position, word), word).toThrow(/word of the language|built-in/);
    expect(() => rename(c.report, 'u', c.position, 'out')).toThrow(/built-in node/);
    // Keywords that are not reserved (field, element and requirement words) are ordinary names: the
    // renamed design parses cleanly and analyses the same.
    const usable = KEYWORDS.filter((k) => !RESERVED_NAMES.has(k));
    expect(usable.length).toBeGreaterThan(0);
    const before = c.report.designs[0]!.runs[0]!.analysis.loop.phaseMarginDeg;
    for (const word of usable) {
      const edit = rename(c.report, 'u', c.position, word)!;
      const after = analyzeDocument(applyEdits(c.text, edit.changes!['u']!));
      expect(after.parsed.diagnostics, word).toEqual([]);
      expect(after.designs[0]!.runs[0]!.analysis.loop.phaseMarginDeg, word).toBe(before);
    }
  });

  it('lets a stage take the name `out`, which a declaration allows', () => {
    const c = cursor(DESIGN('').replace('stage second', 'stage sec|ond'));
    const edit = rename(c.report, 'u', c.position, 'out')!;
    const after = analyzeDocument(applyEdits(c.text, edit.changes!['u']!));
    // `out` is the output node, which the last stage already is: the design reads the same.
    expect(after.parsed.diagnostics).toEqual([]);
    expect(after.designs[0]!.runs[0]!.analysis.loop.phaseMarginDeg).toBe(
      c.report.designs[0]!.runs[0]!.analysis.loop.phaseMarginDeg,
    );
  });

  it('refuses to rename a keyword', () => {
    const c = cursor(DESIGN('').replace('miller first', 'mil|ler first'));
    expect(prepareRename(c.report, c.position)).toBeNull();
  });
  it('lists the outline', () => {
    const c = cursor(DESIGN('') + '|');
    const [d] = documentSymbols(c.report);
    expect(d!.name).toBe('demo');
    expect(d!.children!.map((x) => x.name)).toEqual(['gm1', 'first', 'second', 'require pm', 'require ugf']);
  });
});

describe('inline values, lenses and actions', () => {
  it('shows pass or fail after each requirement and the roots after the compensation', () => {
    const c = cursor(DESIGN('') + '|');
    const hints = inlayHints(c.report, c.document, {
      start: { line: 0, character: 0 },
      end: { line: 99, character: 0 },
    });
    const byLine = new Map(hints.map((h) => [h.position.line, String(h.label)]));
    const loop = c.report.designs[0]!.runs[0]!.analysis.loop;
    expect(byLine.get(6)).toContain(
      `${loop.phaseMarginDeg!.toFixed(1)}° ${loop.phaseMarginDeg! >= 60 ? '✓' : '✗'}`,
    );
    expect(byLine.get(7)).toContain(`${formatHz(loop.ugfHz!)} ${loop.ugfHz! >= 5e6 ? '✓' : '✗'}`);
    expect(byLine.get(5)).toMatch(/^ {2}poles .* · zeros .*RHP/);
    // The hint goes after the comment, at the end of the line.
    expect(hints.find((h) => h.position.line === 5)!.position.character).toBe(c.text.split('\n')[5]!.length);
  });
  it('puts the summary and the panel lens above the design', () => {
    const c = cursor(DESIGN('') + '|');
    const lenses = codeLenses(c.report, 'u');
    expect(lenses.map((l) => l.range.start.line)).toEqual([0, 0]);
    expect(lenses[1]!.command).toEqual({
      title: 'show pole split',
      command: 'ampnote.showPanel',
      arguments: [{ uri: 'u', design: 'demo' }],
    });
  });
  it('offers the fixes of the findings the range touches, and only those', async () => {
    const c = cursor(DESIGN('').replace('gm = 1.5 mS', 'gm = 600 uS') + '|');
    const finding = c.report.findings.find((f) => f.code === 'gm-ratio')!;
    const at = await codeActions(
      c.report,
      {
        textDocument: { uri: 'u' },
        range: finding.range,
        context: { diagnostics: [] },
      },
      NEVER,
    );
    expect(at.length).toBeGreaterThan(0);
    expect(at.every((a) => a.kind === 'quickfix' && a.edit?.changes?.['u']?.length)).toBe(true);
    const refactor = await codeActions(
      c.report,
      {
        textDocument: { uri: 'u' },
        range: finding.range,
        context: { diagnostics: [], only: ['refactor'] },
      },
      NEVER,
    );
    expect(refactor).toEqual([]);
    const asked = await codeActions(
      c.report,
      {
        textDocument: { uri: 'u' },
        range: finding.range,
        context: { diagnostics: [], only: ['quickfix'] },
      },
      NEVER,
    );
    expect(asked).toHaveLength(at.length);
    // Fixes are solved only for the findings the range touches.
    let solved = 0;
    const counted = {
      ...c.report,
      findings: c.report.findings.map((f) =>
        withLazyFixes({ ...f, fixes: undefined } as never, () => {
          solved++;
          return [];
        }),
      ),
    };
    await codeActions(
      counted,
      { textDocument: { uri: 'u' }, range: finding.range, context: { diagnostics: [] } },
      NEVER,
    );
    expect(solved).toBe(c.report.findings.filter((f) => rangesMeet(f.range, finding.range)).length);
    expect(solved).toBeLessThan(c.report.findings.length);
    const none = await codeActions(
      c.report,
      {
        textDocument: { uri: 'u' },
        range: { start: { line: 4, character: 0 }, end: { line: 4, character: 1 } },
        context: { diagnostics: [] },
      },
      NEVER,
    );
    expect(none).toEqual([]);
  });
});

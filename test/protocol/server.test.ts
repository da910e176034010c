// The built language server over stdio: diagnostics, hover values, inlay hints, quick fixes, rapid edits,
// settings, and bad requests answered without the server dying.
import { execFileSync, fork } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createMessageConnection, IPCMessageReader, IPCMessageWriter } from 'vscode-jsonrpc/node';
import type {
  CodeAction,
  CodeLens,
  Hover,
  InlayHint,
  PublishDiagnosticsParams,
  WorkspaceEdit,
} from 'vscode-languageserver-protocol';
import { analyzeDesign } from '../../shared/src/analysis';
import { formatHz } from '../../shared/src/format/si';
import { parseDocument } from '../../shared/src/language';
import { analyzeDocument } from '../../shared/src/service';
import { applyEdits, LspClient, ROOT, waitFor } from './lspClient';

let client: LspClient;
let capabilities: Record<string, unknown>;

beforeAll(async () => {
  execFileSync(process.execPath, ['scripts/build.mjs'], { cwd: ROOT, stdio: 'inherit' });
  const started = await LspClient.start();
  client = started.client;
  capabilities = started.init.capabilities as Record<string, unknown>;
}, 120_000);

afterAll(async () => {
  await client?.stop();
});

const EXAMPLES = readdirSync(resolve(ROOT, 'examples')).filter((f) => f.endsWith('.ampnote'));
const key = (d: {
  code?: unknown;
  range: { start: { line: number; character: number }; end: { line: number; character: number } };
}) =>
  `${String(d.code)}@${d.range.start.line}:${d.range.start.character}-${d.range.end.line}:${d.range.end.character}`;

describe('language server over stdio', () => {
  it('announces its features', () => {
    for (const c of [
      'hoverProvider',
      'inlayHintProvider',
      'codeActionProvider',
      'codeLensProvider',
      'completionProvider',
      'documentSymbolProvider',
      'definitionProvider',
      'renameProvider',
    ])
      expect(capabilities[c], c).toBeTruthy();
  });

  it.each(EXAMPLES)('publishes the findings of %s with their codes at their ranges', async (file) => {
    const uri = client.openFile(`examples/${file}`);
    const text = readFileSync(resolve(ROOT, 'examples', file), 'utf8');
    // A document with sweeps is published twice: the ordinary findings, then with the sweeps' added.
    const publishes = /^\s*sweep\s/m.test(text) ? 2 : 1;
    const diagnostics = await waitFor(
      () => {
        const list = client.published.get(uri)?.filter((p) => p.version === 1) ?? [];
        return list.length >= publishes ? list.at(-1)!.diagnostics : undefined;
      },
      20_000,
      `diagnostics of ${file}`,
    );
    const expected = analyzeDocument(text).findings.map(key).sort();
    expect(diagnostics.map(key).sort()).toEqual(expected);
    for (const d of diagnostics) {
      expect(d.source).toBe('ampnote');
      expect(d.codeDescription?.href).toMatch(new RegExp(`^file://.*docs/checks\\.md#${String(d.code)}$`));
    }
  });

  it('publishes a design’s ordinary findings first, then again with its sweeps’ findings', async () => {
    // Earlier tests may have opened the same file: only what is published from here on counts.
    client.published.delete(pathToFileURL(resolve(ROOT, 'examples/twoStageLoadSweep.ampnote')).href);
    const uri = client.openFile('examples/twoStageLoadSweep.ampnote');
    const text = readFileSync(resolve(ROOT, 'examples/twoStageLoadSweep.ampnote'), 'utf8');
    const list = await waitFor(
      () => {
        const l = client.published.get(uri)?.filter((p) => p.version === 1) ?? [];
        return l.length >= 2 ? l : undefined;
      },
      20_000,
      'two publishes',
    );
    const [ordinary, swept] = list as [(typeof list)[0], (typeof list)[0]];
    // The example's phase margin fails inside the swept range (its own comment): a `sweep` finding.
    expect(ordinary.diagnostics.filter((d) => d.code === 'sweep')).toEqual([]);
    expect(swept.diagnostics.filter((d) => d.code === 'sweep').length).toBeGreaterThan(0);
    expect(ordinary.at).toBeLessThanOrEqual(swept.at);
    // Together they are what the terminal reports in one pass.
    expect(swept.diagnostics.map(key).sort()).toEqual(analyzeDocument(text).findings.map(key).sort());
    // The sweep's code lens reads the swept report.
    const lenses = await client.request<CodeLens[]>('textDocument/codeLens', { textDocument: { uri } });
    expect(lenses.some((l) => /^PM .* over cl \(worst/.test(l.command?.title ?? ''))).toBe(true);
    client.close(uri);
  });

  it('stops a document’s sweeps when its text changes, and sweeps the new text', async () => {
    // The regulator example's sweep (every point parsed, three corners) takes hundreds of milliseconds.
    const text = readFileSync(resolve(ROOT, 'examples/ldoSensorRail.ampnote'), 'utf8');
    const uri = 'file:///protocol/sweep-cancel.ampnote';
    client.open(uri, text);
    await client.diagnosticsFor(uri, 1, 60_000);
    // At once, while version 1's sweeps run: an edit.
    const v = client.change(uri, text.replace('param r1    = 200 kohm', 'param r1    = 201 kohm'));
    const published = (version: number) =>
      (client.published.get(uri) ?? []).filter((p) => p.version === version);
    await waitFor(() => (published(v).length >= 2 ? true : undefined), 60_000, 'the new version swept');
    // Version 1 was published once: its sweeps were stopped, not finished after the edit.
    expect(published(1)).toHaveLength(1);
    // The new version's second publish adds the sweep's findings of the terminal's one pass on the edited text.
    const edited = text.replace('param r1    = 200 kohm', 'param r1    = 201 kohm');
    const sweepKeys = (ds: readonly { code?: unknown; range: Parameters<typeof key>[0]['range'] }[]) =>
      ds
        .filter((d) => d.code === 'sweep')
        .map(key)
        .sort();
    expect(sweepKeys(published(v)[1]!.diagnostics)).toEqual(sweepKeys(analyzeDocument(edited).findings));
    expect(sweepKeys(published(v)[0]!.diagnostics)).toEqual([]);
    client.close(uri);
  });

  it('reports the RHP zero on the Miller line and gm-ratio on the second stage gm', async () => {
    const uri = client.openFile('examples/twoStageRhpZero.ampnote');
    const diagnostics = await client.diagnosticsFor(uri, 1);
    const text = readFileSync(resolve(ROOT, 'examples/twoStageRhpZero.ampnote'), 'utf8');
    const model = parseDocument(text).designs[0]!.nominal!;
    const rhp = diagnostics.find((d) => d.code === 'rhp-zero')!;
    expect(rhp.range).toEqual(model.millers[0]!.origin.range);
    const ratio = diagnostics.find((d) => d.code === 'gm-ratio')!;
    expect(ratio.range).toEqual(model.stages[1]!.origin.fields['gm']!.range);
    expect(diagnostics.find((d) => d.code === 'phase-margin')!.range).toEqual(
      model.millers[0]!.origin.fields['cc']!.range,
    );
  });

  it('hovers the Miller line with the exact poles and the zero', async () => {
    const uri = client.openFile('examples/twoStageRhpZero.ampnote');
    const text = readFileSync(resolve(ROOT, 'examples/twoStageRhpZero.ampnote'), 'utf8');
    const model = parseDocument(text).designs[0]!.nominal!;
    const line = model.millers[0]!.origin.range.start.line;
    const h = await client.request<Hover | null>('textDocument/hover', {
      textDocument: { uri },
      position: { line, character: 4 },
    });
    const value = (h!.contents as { value: string }).value;
    // The engine's own numbers…
    for (const p of analyzeDesign(model).poles) expect(value).toContain(formatHz(p.hz));
    // …and the same poles from the two-stage Miller denominator (GHLM ch. 9, from memory; re-derived):
    // D(s) = 1 + s[(C1+Cc)R1 + (C2+Cc)R2 + gm2·R1·R2·Cc] + s²·R1·R2·(C1C2 + Cc(C1+C2)), zero at +gm2/Cc.
    const [gm2, r1, c1, cc] = [350e-6, 2e6, 150e-15, 1e-12];
    const r2 = 1 / (1 / 200e3 + 1 / 2e6); // stage rout in parallel with the load resistance
    const c2 = 200e-15 + 1e-12; // stage cap plus the load cap
    const a1 = (c1 + cc) * r1 + (c2 + cc) * r2 + gm2 * r1 * r2 * cc;
    const a2 = r1 * r2 * (c1 * c2 + cc * (c1 + c2));
    const disc = Math.sqrt(a1 * a1 - 4 * a2);
    const hand = [(a1 - disc) / (2 * a2), (a1 + disc) / (2 * a2)].map((w) => formatHz(w / (2 * Math.PI)));
    for (const p of hand) expect(value).toContain(p);
    expect(value).toContain(`${formatHz(gm2 / cc / (2 * Math.PI))} RHP`);
    expect(value).toContain('Small-signal');
  });

  it('hovers a requirement with measured, required and margin', async () => {
    const uri = client.openFile('examples/twoStageRhpZero.ampnote');
    const text = readFileSync(resolve(ROOT, 'examples/twoStageRhpZero.ampnote'), 'utf8');
    const model = parseDocument(text).designs[0]!.nominal!;
    const pm = model.requirements.find((r) => r.kind === 'pm')!;
    const h = await client.request<Hover | null>('textDocument/hover', {
      textDocument: { uri },
      position: pm.origin.range.start,
    });
    const value = (h!.contents as { value: string }).value;
    const measured = analyzeDesign(model).loop.phaseMarginDeg!;
    expect(value).toContain(`${measured.toFixed(1)}°`);
    expect(value).toContain('FAIL');
    expect(value).toContain('60.0°');
  });

  it('shows inlay hints after the compensation line and the requirements', async () => {
    const uri = client.openFile('examples/twoStageRhpZero.ampnote');
    const text = readFileSync(resolve(ROOT, 'examples/twoStageRhpZero.ampnote'), 'utf8');
    const model = parseDocument(text).designs[0]!.nominal!;
    const hints = await client.request<InlayHint[]>('textDocument/inlayHint', {
      textDocument: { uri },
      range: { start: { line: 0, character: 0 }, end: { line: 200, character: 0 } },
    });
    const at = (line: number) =>
      hints
        .filter((h) => h.position.line === line)
        .map((h) => String(h.label))
        .join(' ');
    expect(at(model.millers[0]!.origin.range.start.line)).toContain('poles');
    const pm = model.requirements.find((r) => r.kind === 'pm')!;
    expect(at(pm.origin.range.start.line)).toMatch(/5\d\.\d° ✗/);
    const ugf = model.requirements.find((r) => r.kind === 'ugf')!;
    expect(at(ugf.origin.range.start.line)).toContain('✓');
  });

  it('applies a quick fix and the finding is gone on re-validation', async () => {
    const text = readFileSync(resolve(ROOT, 'examples/twoStageRhpZero.ampnote'), 'utf8');
    const uri = 'file:///virtual/quickfix.ampnote';
    client.open(uri, text);
    const diagnostics = await client.diagnosticsFor(uri, 1);
    const rhp = diagnostics.find((d) => d.code === 'rhp-zero')!;
    const actions = await client.request<CodeAction[]>('textDocument/codeAction', {
      textDocument: { uri },
      range: rhp.range,
      context: { diagnostics: [rhp] },
    });
    const fix = actions.find(
      (a) => a.title.includes('moves the zero to infinity') && a.diagnostics?.[0]?.code === 'rhp-zero',
    )!;
    expect(fix.isPreferred).toBe(true);
    const edited = applyEdits(text, (fix.edit as WorkspaceEdit).changes![uri]!);
    expect(edited).toMatch(/cc = 1 pF rz = 2\.86 kohm/);
    const version = client.change(uri, edited);
    const after = await client.diagnosticsFor(uri, version);
    expect(after.map((d) => d.code)).not.toContain('rhp-zero');
    expect(after.map((d) => d.code)).not.toContain('gm-ratio');
  });

  it('applies the phase-margin fix (Cc solved on the exact model) and the finding is gone', async () => {
    const text = readFileSync(resolve(ROOT, 'examples/twoStageRhpZero.ampnote'), 'utf8');
    const uri = 'file:///virtual/quickfix-pm.ampnote';
    client.open(uri, text);
    const pm = (await client.diagnosticsFor(uri, 1)).find((d) => d.code === 'phase-margin')!;
    const actions = await client.request<CodeAction[]>('textDocument/codeAction', {
      textDocument: { uri },
      range: pm.range,
      context: { diagnostics: [pm] },
    });
    const setCc = actions.find((a) => a.title.startsWith('Set cc'))!;
    const edits = (setCc.edit as WorkspaceEdit).changes![uri]!;
    expect(edits).toHaveLength(1);
    expect(edits[0]!.range).toEqual(pm.range);
    const version = client.change(uri, applyEdits(text, edits));
    expect((await client.diagnosticsFor(uri, version)).map((d) => d.code)).not.toContain('phase-margin');
  });

  it('after 200 rapid edits publishes diagnostics for the final version only', async () => {
    const base = readFileSync(resolve(ROOT, 'examples/twoStageRhpZero.ampnote'), 'utf8');
    const uri = 'file:///virtual/rapid.ampnote';
    client.open(uri, base);
    await client.diagnosticsFor(uri, 1);
    const before = client.published.get(uri)!.length;
    let last = 1;
    let text = base;
    for (let i = 1; i <= 200; i++) {
      text = base.replace('cc = 1 pF', `cc = ${(1 + i / 100).toFixed(2)} pF`);
      last = client.change(uri, text);
    }
    const final = await client.diagnosticsFor(uri, last);
    const during = client.published.get(uri)!.slice(before);
    expect(during.map((p) => p.version)).toEqual([last]);
    expect(final.map(key).sort()).toEqual(analyzeDocument(text).findings.map(key).sort());
  });

  it('re-reads settings when the configuration changes', async () => {
    // Without its own `require pm`, the design is judged against the phaseMargin setting.
    const uri = 'file:///virtual/settings.ampnote';
    client.open(
      uri,
      readFileSync(resolve(ROOT, 'examples/twoStageRhpZero.ampnote'), 'utf8').replace(
        /^ *require pm .*\n/m,
        '',
      ),
    );
    const first = await client.diagnosticsFor(uri, 1);
    expect(first.map((d) => d.code)).toContain('phase-margin');
    const count = client.published.get(uri)!.length;
    client.configuration = { phaseMargin: 50 };
    await client.connection.sendNotification('workspace/didChangeConfiguration', { settings: {} });
    const relaxed = await waitFor(
      () => client.published.get(uri)!.slice(count).at(-1)?.diagnostics,
      10_000,
      'new diagnostics',
    );
    expect(relaxed.map((d) => d.code)).not.toContain('phase-margin');
    client.configuration = {};
    const count2 = client.published.get(uri)!.length;
    await client.connection.sendNotification('workspace/didChangeConfiguration', { settings: {} });
    await waitFor(
      () => client.published.get(uri)!.slice(count2).at(-1)?.diagnostics,
      10_000,
      'diagnostics again',
    );
  });

  it('answers symbols, definition, rename, completion and lenses', async () => {
    const uri = client.openFile('examples/twoStageRhpZero.ampnote');
    const text = readFileSync(resolve(ROOT, 'examples/twoStageRhpZero.ampnote'), 'utf8');
    const source = parseDocument(text).designs[0]!;
    const gm1 = source.symbols.find((s) => s.name === 'gm1')!;
    const symbols = await client.request<{ name: string; children: { name: string }[] }[]>(
      'textDocument/documentSymbol',
      { textDocument: { uri } },
    );
    expect(symbols[0]!.name).toBe('bridge_readout');
    expect(symbols[0]!.children.map((c) => c.name)).toEqual(
      expect.arrayContaining(['gm1', 'first', 'second']),
    );
    const def = await client.request<{ range: unknown }>('textDocument/definition', {
      textDocument: { uri },
      position: gm1.references[0]!.start,
    });
    expect(def.range).toEqual(gm1.declaration);
    const prep = await client.request<{ placeholder: string } | null>('textDocument/prepareRename', {
      textDocument: { uri },
      position: gm1.references[0]!.start,
    });
    expect(prep?.placeholder).toBe('gm1');
    const edit = await client.request<WorkspaceEdit>('textDocument/rename', {
      textDocument: { uri },
      position: gm1.declaration.start,
      newName: 'gm_in',
    });
    const renamed = applyEdits(text, edit.changes![uri]!);
    expect(renamed.match(/\bgm_in\b/g)).toHaveLength(1 + gm1.references.length);
    expect(analyzeDocument(renamed).parsed.diagnostics).toEqual([]);
    await expect(
      client.request('textDocument/rename', {
        textDocument: { uri },
        position: gm1.declaration.start,
        newName: 'second',
      }),
    ).rejects.toThrow(/already declared/);
    const items = await client.request<{ label: string }[]>('textDocument/completion', {
      textDocument: { uri },
      position: { line: 17, character: 2 },
    });
    expect(items.map((i) => i.label)).toEqual(expect.arrayContaining(['stage', 'miller', 'require']));
    const lenses = await client.request<CodeLens[]>('textDocument/codeLens', { textDocument: { uri } });
    expect(lenses.map((l) => l.command?.title)).toEqual(
      expect.arrayContaining([expect.stringMatching(/^UGF .* · PM /), 'show pole split']),
    );
    expect(lenses.find((l) => l.command?.command === 'ampnote.showPanel')!.command!.arguments).toEqual([
      { uri, design: 'bridge_readout' },
    ]);
  });

  it('answers the panel, summary and compensation-edit requests', async () => {
    const uri = client.openFile('examples/twoStageRhpZero.ampnote');
    const text = readFileSync(resolve(ROOT, 'examples/twoStageRhpZero.ampnote'), 'utf8');
    const model = parseDocument(text).designs[0]!.nominal!;
    const exact = analyzeDesign(model);
    const panel = await client.request<{ poles: { hz: number }[]; caution: string } | null>(
      'ampnote/panelData',
      { uri, design: 'bridge_readout' },
    );
    expect(panel!.poles.map((p) => p.hz)).toEqual(exact.poles.map((p) => p.hz));
    const summary = await client.request<{ design: string; ugfHz: number } | null>('ampnote/designSummary', {
      uri,
      position: { line: 15, character: 0 },
    });
    expect(summary!.design).toBe('bridge_readout');
    expect(summary!.ugfHz).toBeCloseTo(exact.loop.ugfHz!, 0);
    const edit = await client.request<{ edits: { newText: string }[] } | null>('ampnote/compensationEdit', {
      uri,
      design: 'bridge_readout',
      cc: 1.5e-12,
      rz: 3000,
    });
    expect(edit!.edits.map((e) => e.newText)).toEqual(['1.5 pF', ' rz = 3 kohm']);
  });

  it('answers the panel at free-parameter values, and the solve with the values it found', async () => {
    const file = 'examples/twoStageFromBiasCurrents.ampnote';
    const uri = client.openFile(file);
    const design = parseDocument(readFileSync(resolve(ROOT, file), 'utf8')).designs[0]!.name;
    type Panel = {
      free: { sliders: { name: string; value: number }[]; edits: { newText: string }[]; refused?: string };
    } | null;
    const moved = await client.request<Panel>('ampnote/panelData', { uri, design, free: { id1: 10e-6 } });
    expect(moved!.free.sliders.map((s) => s.name)).toEqual(['id1', 'id2', 'cc', 'rz']);
    expect(moved!.free.sliders[0]!.value).toBe(10e-6);
    // Only the moved value, in the file's own spelling (`param id1 = 4 uA`).
    expect(moved!.free.edits.map((e) => e.newText)).toEqual(['10 uA']);
    const junk = await client.request<Panel>('ampnote/panelData', { uri, design, free: { id1: 'x', cc: 1 } });
    expect(junk!.free.refused).toMatch(/cc = 1 F lies outside its bounds/);
    const solve = await client.request<{ status: string; values: { name: string; value: number }[] } | null>(
      'ampnote/solveDesign',
      { uri, design },
    );
    expect(solve!.status).toBe('met');
    expect(solve!.values.map((v) => v.name)).toEqual(['id1', 'id2', 'cc', 'rz']);
  });

  it('sweeps and writes the compensation element asked for, on a nested-Miller design', async () => {
    const file = 'examples/threeStageNestedMiller.ampnote';
    const uri = client.openFile(file);
    const text = readFileSync(resolve(ROOT, file), 'utf8');
    const model = parseDocument(text).designs[0]!.nominal!;
    const lines = text.split('\n');
    const innerLine = lines.findIndex((l) => /^\s*miller second -> third/.test(l));
    expect(innerLine).toBeGreaterThan(0);
    type Panel = {
      compensation: { kind: string; index: number; ccWritten: number; label: string };
      compensationChoices: { kind: string; index: number; label: string }[];
      locus: { poles: { cc: number[] }[] };
    } | null;
    const outer = await client.request<Panel>('ampnote/panelData', { uri, design: model.name });
    expect(outer!.compensation).toMatchObject({ kind: 'miller', index: 0, ccWritten: model.millers[0]!.cc });
    expect(outer!.compensationChoices.map((c) => c.label)).toEqual([
      'miller first -> third',
      'miller second -> third',
    ]);
    const inner = await client.request<Panel>('ampnote/panelData', {
      uri,
      design: model.name,
      compensation: { kind: 'miller', index: 1 },
    });
    expect(inner!.compensation).toMatchObject({
      kind: 'miller',
      index: 1,
      ccWritten: model.millers[1]!.cc,
      label: 'miller second -> third',
    });
    // The sweep spans the inner capacitor's own value (factor 100 either way, sweepValues).
    expect(Math.max(...inner!.locus.poles[0]!.cc)).toBeCloseTo(model.millers[1]!.cc * 100, 20);
    // The cursor on the inner capacitor's line pre-selects it; elsewhere the first stays the default.
    const at = await client.request<Panel>('ampnote/panelData', {
      uri,
      position: { line: innerLine, character: 2 },
      compensationAt: { line: innerLine, character: 2 },
    });
    expect(at!.compensation).toMatchObject({ kind: 'miller', index: 1 });
    // The element under the cursor takes precedence over an earlier choice; off such a line the choice holds.
    const over = await client.request<Panel>('ampnote/panelData', {
      uri,
      design: model.name,
      compensation: { kind: 'miller', index: 0 },
      compensationAt: { line: innerLine, character: 0 },
    });
    expect(over!.compensation).toMatchObject({ kind: 'miller', index: 1 });
    const off = await client.request<Panel>('ampnote/panelData', {
      uri,
      design: model.name,
      compensation: { kind: 'miller', index: 1 },
      compensationAt: { line: innerLine - 2, character: 0 },
    });
    expect(off!.compensation).toMatchObject({ kind: 'miller', index: 1 });
    const stale = await client.request<Panel>('ampnote/panelData', {
      uri,
      design: model.name,
      compensation: { kind: 'miller', index: 7 },
    });
    expect(stale!.compensation).toMatchObject({ kind: 'miller', index: 0 });

    const edit = await client.request<{
      edits: { range: { start: { line: number } }; newText: string }[];
    } | null>('ampnote/compensationEdit', {
      uri,
      design: model.name,
      cc: 5.4321e-12,
      compensation: { kind: 'miller', index: 1 },
    });
    // Rounded to 3 significant digits, written into the inner capacitor's line only.
    expect(edit!.edits.map((e) => [e.range.start.line, e.newText])).toEqual([[innerLine, '5.43 pF']]);
    const applied = applyEdits(text, edit!.edits as never);
    const after = parseDocument(applied).designs[0]!.nominal!;
    expect(after.millers[1]!.cc).toBeCloseTo(5.43e-12, 24);
    expect(after.millers[0]!.cc).toBe(model.millers[0]!.cc);
    // A target the design does not have, or a malformed one, writes nothing.
    for (const compensation of [{ kind: 'miller', index: 2 }, { kind: 'buffered', index: 0 }, { kind: 'x' }])
      expect(
        await client.request('ampnote/compensationEdit', {
          uri,
          design: model.name,
          cc: 3e-12,
          compensation,
        }),
      ).toBeNull();
  });

  it('answers bad requests without dying', async () => {
    const uri = client.openFile('examples/twoStageRhpZero.ampnote');
    await client.diagnosticsFor(uri, 1);
    expect(
      await client.request('textDocument/hover', {
        textDocument: { uri },
        position: { line: 9999, character: 3 },
      }),
    ).toBeNull();
    expect(
      await client.request('textDocument/hover', {
        textDocument: { uri },
        position: { line: -4, character: -1 },
      }),
    ).toBeNull();
    expect(
      await client.request('textDocument/hover', {
        textDocument: { uri: 'file:///nope.ampnote' },
        position: { line: 0, character: 0 },
      }),
    ).toBeNull();
    expect(
      await client.request('textDocument/hover', { textDocument: { uri }, position: 'here' }),
    ).toBeNull();
    expect(await client.request('textDocument/hover', {})).toBeNull();
    expect(await client.request('textDocument/inlayHint', { textDocument: { uri } })).toEqual([]);
    expect(await client.request('textDocument/codeAction', { textDocument: { uri }, range: null })).toEqual(
      [],
    );
    expect(
      await client.request('textDocument/completion', {
        textDocument: { uri },
        position: { line: 500, character: 80 },
      }),
    ).toBeDefined();
    expect(await client.request('ampnote/panelData', { uri: 42 })).toBeNull();
    expect(await client.request('ampnote/designSummary', { uri, position: null })).toBeNull();
    expect(await client.request('ampnote/compensationEdit', { uri, design: 'nope', cc: 'big' })).toBeNull();
    const garbled = 'file:///virtual/garbled.ampnote';
    client.open(garbled, 'design \u0000 ??? \n stage = = =\n miller -> -> cc = 1 F\nend end end\n'.repeat(3));
    const diags = await client.diagnosticsFor(garbled, 1);
    expect(diags.length).toBeGreaterThan(0);
    // Still alive and answering.
    const h = await client.request<Hover | null>('textDocument/hover', {
      textDocument: { uri },
      position: { line: 18, character: 4 },
    });
    expect(h).not.toBeNull();
    expect(client.exited).toBe(false);
    expect(client.logs.join('\n')).toMatch(/\[hover\]/);
  });

  it('clears diagnostics when a document closes', async () => {
    const uri = 'file:///virtual/closing.ampnote';
    client.open(uri, readFileSync(resolve(ROOT, 'examples/twoStageRhpZero.ampnote'), 'utf8'));
    await client.diagnosticsFor(uri, 1);
    const n = client.published.get(uri)!.length;
    client.close(uri);
    const cleared = await waitFor(
      () => client.published.get(uri)!.slice(n).at(-1),
      10_000,
      'cleared diagnostics',
    );
    expect(cleared.diagnostics).toEqual([]);
  });
});

// The same server over Node IPC, as the VS Code client starts it (after the build above).
describe('language server over --node-ipc', () => {
  it('initializes and publishes diagnostics', async () => {
    const child = fork(resolve(ROOT, 'dist/server.js'), ['--node-ipc'], { silent: true });
    const connection = createMessageConnection(new IPCMessageReader(child), new IPCMessageWriter(child));
    const published: PublishDiagnosticsParams[] = [];
    connection.onNotification('textDocument/publishDiagnostics', (p: PublishDiagnosticsParams) => {
      published.push(p);
    });
    connection.listen();
    try {
      const init = (await connection.sendRequest('initialize', {
        processId: process.pid,
        rootUri: null,
        capabilities: {},
      })) as {
        capabilities: Record<string, unknown>;
      };
      expect(init.capabilities['hoverProvider']).toBe(true);
      await connection.sendNotification('initialized', {});
      const text = readFileSync(resolve(ROOT, 'examples/twoStageRhpZero.ampnote'), 'utf8');
      await connection.sendNotification('textDocument/didOpen', {
        textDocument: { uri: 'file:///ipc.ampnote', languageId: 'ampnote', version: 1, text },
      });
      const got = await waitFor(
        () => published.find((p) => p.uri === 'file:///ipc.ampnote'),
        20_000,
        'diagnostics',
      );
      expect(got.diagnostics.map((d) => d.code)).toEqual(expect.arrayContaining(['rhp-zero', 'gm-ratio']));
      // A client that cannot be asked per document pushes its settings with the notification.
      const count = published.length;
      await connection.sendNotification('workspace/didChangeConfiguration', {
        settings: { ampnote: { checks: { gmRatio: 3 } } },
      });
      const relaxed = await waitFor(() => published.slice(count).at(-1), 20_000, 'new diagnostics');
      expect(relaxed.diagnostics.map((d) => d.code)).not.toContain('gm-ratio');
      expect(relaxed.diagnostics.map((d) => d.code)).toContain('rhp-zero');
      await connection.sendRequest('shutdown');
      await connection.sendNotification('exit');
      await waitFor(() => (child.exitCode !== null ? true : undefined), 5000, 'exit');
    } finally {
      connection.dispose();
      if (child.exitCode === null) child.kill();
    }
  });
});

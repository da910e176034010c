// The bundled server over stdio with inputs an editor or a user can produce while typing: other line
// endings, a design without a name yet, overlapping findings, huge selections cancelled part-way, panel
// values a design cannot hold, malformed notifications and requests after shutdown.
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CancellationTokenSource, ResponseError } from 'vscode-jsonrpc/node';
import type { CodeAction, Diagnostic, DocumentSymbol, InlayHint } from 'vscode-languageserver-protocol';
import { LspClient, ROOT, waitFor } from './lspClient';

/** Longer than any test here waits for diagnostics: an open that waited for it could not pass. */
const LONG_DELAY_MS = 120_000;

let client: LspClient;

beforeAll(async () => {
  execFileSync(process.execPath, ['scripts/build.mjs'], { cwd: ROOT, stdio: 'inherit' });
  client = (await LspClient.start({ validationDelayMs: LONG_DELAY_MS })).client;
}, 120_000);

afterAll(async () => {
  await client?.stop();
});

const example = (name: string) => readFileSync(resolve(ROOT, 'examples', name), 'utf8');
/** Line lengths as the protocol counts lines (\n, \r\n and lone \r end a line; specification 3.17). */
const lineLengths = (text: string) => text.split(/\r\n|\r|\n/).map((l) => l.length);

/** A request sent with a token that is cancelled `afterMs` later; resolves to its answer or its error. */
async function cancelledAfter<R>(method: string, params: unknown, afterMs: number) {
  const source = new CancellationTokenSource();
  const answer = client.connection.sendRequest(method, params, source.token) as Promise<R>;
  const timer = setTimeout(() => source.cancel(), afterMs);
  try {
    return { result: await answer };
  } catch (error) {
    return { error: error as ResponseError<unknown> };
  } finally {
    clearTimeout(timer);
  }
}

describe('positions', () => {
  it.each(['\r', '\r\n', '\n'])(
    'puts every inlay hint at the end of its line with %j line endings',
    async (br) => {
      const text = example('twoStageRhpZero.ampnote').replace(/\r?\n/g, br);
      const uri = `file:///virtual/endings-${br === '\r' ? 'cr' : br === '\n' ? 'lf' : 'crlf'}.ampnote`;
      client.open(uri, text);
      const hints = await client.request<InlayHint[]>('textDocument/inlayHint', {
        textDocument: { uri },
        range: { start: { line: 0, character: 0 }, end: { line: 999, character: 0 } },
      });
      expect(hints.length).toBeGreaterThan(2);
      const lengths = lineLengths(text);
      for (const h of hints) expect(h.position.character).toBe(lengths[h.position.line]);
    },
  );
});

describe('outline while typing', () => {
  it('never gives a symbol an empty name', async () => {
    const uri = 'file:///virtual/unnamed.ampnote';
    client.open(uri, 'design\n  stage first gm = 1 mS rout = 1 Mohm cap = 1 pF\nend\ndesign \nend\n');
    const symbols = await client.request<DocumentSymbol[]>('textDocument/documentSymbol', {
      textDocument: { uri },
    });
    expect(symbols.length).toBe(2);
    const names = (list: DocumentSymbol[]): string[] =>
      list.flatMap((s) => [s.name, ...names(s.children ?? [])]);
    for (const name of names(symbols)) expect(name.trim()).not.toBe('');
    expect(symbols[0]!.name).toBe('(unnamed design)');
    expect(symbols[0]!.children!.map((c) => c.name)).toContain('first');
  });
});

describe('diagnostics on open', () => {
  it('validates an opened document at once, without waiting for the edit delay', async () => {
    // This server waits LONG_DELAY_MS after an edit; the open must not wait for it.
    const uri = 'file:///virtual/opened.ampnote';
    client.open(uri, example('twoStageRhpZero.ampnote'));
    const diagnostics = await client.diagnosticsFor(uri, 1, 30_000);
    expect(diagnostics.some((d) => d.code === 'rhp-zero')).toBe(true);
  });
});

describe('quick fixes', () => {
  // An invented nested-Miller design: stage third's gm is wrapped by two Miller capacitors, so two
  // gm-ratio findings start at the same place (gm3/gm1 = 6 and gm3/gm2 = 1.5, both below the default 10).
  const NESTED = `design nest
  param gm1 = 50 uS
  stage first   gm = gm1     rout = 1 Mohm    cap = 50 fF
  stage second  gm = 200 uS  rout = 500 kohm  cap = 100 fF
  stage third   gm = 300 uS  rout = 50 kohm   cap = 300 fF  inverting
  load cap = 20 pF res = 100 kohm
  miller first  -> third  cc = 2.5 pF
  miller second -> third  cc = 4 pF
  require pm >= 60 deg
end
`;

  it('attaches each fix to the diagnostic of its own finding', async () => {
    const uri = 'file:///virtual/nested.ampnote';
    client.open(uri, NESTED);
    const diagnostics = await client.diagnosticsFor(uri, 1, 30_000);
    const ratios = diagnostics.filter((d) => d.code === 'gm-ratio');
    expect(ratios).toHaveLength(2);
    expect(ratios[0]!.range.start).toEqual(ratios[1]!.range.start);
    expect(ratios[0]!.message).not.toBe(ratios[1]!.message);
    const actions = await client.request<CodeAction[]>('textDocument/codeAction', {
      textDocument: { uri },
      range: ratios[0]!.range,
      context: { diagnostics: ratios },
    });
    const attached = (d: Diagnostic) =>
      actions.filter((a) => a.diagnostics?.some((x) => x.message === d.message));
    // Both findings have fixes, and each fix names exactly one of the two diagnostics.
    expect(attached(ratios[0]!).length).toBeGreaterThan(0);
    expect(attached(ratios[1]!).length).toBeGreaterThan(0);
    for (const a of actions.filter((x) => x.diagnostics?.[0]?.code === 'gm-ratio'))
      expect(a.diagnostics).toHaveLength(1);
  });

  it('honours a cancellation over a selection of many designs', async () => {
    // Many copies of an example under distinct names: every copy has findings with fixes to solve.
    const base = example('twoStageRhpZero.ampnote');
    const copies = 12;
    const text = Array.from({ length: copies }, (_, i) =>
      base.replace(/^design (\w+)/m, `design $1_${i}`),
    ).join('\n');
    const uri = 'file:///virtual/many.ampnote';
    client.open(uri, text);
    await client.diagnosticsFor(uri, 1, 60_000);
    const params = {
      textDocument: { uri },
      range: { start: { line: 0, character: 0 }, end: { line: text.split('\n').length, character: 0 } },
      context: { diagnostics: [] },
    };
    const cancelled = await cancelledAfter<CodeAction[]>('textDocument/codeAction', params, 5);
    // LSP 3.17: a request the server stops on a cancellation answers with RequestCancelled (-32800).
    expect(cancelled.result).toBeUndefined();
    expect(cancelled.error?.code).toBe(-32800);
    // Uncancelled, the same request answers with the fixes of every copy.
    const all = await client.request<CodeAction[]>('textDocument/codeAction', params);
    const perCopy = await client.request<CodeAction[]>('textDocument/codeAction', {
      ...params,
      range: { start: { line: 0, character: 0 }, end: { line: base.split('\n').length - 1, character: 0 } },
    });
    expect(perCopy.length).toBeGreaterThan(0);
    expect(all.length).toBe(perCopy.length * copies);
  }, 120_000);
});

describe('panel edits', () => {
  const edit = (params: Record<string, unknown>) =>
    client.request<{ edits: unknown[]; refused?: string } | null>('ampnote/compensationEdit', params);

  it('refuses values a design cannot hold, and says why', async () => {
    const uri = 'file:///virtual/apply.ampnote';
    client.open(uri, example('twoStageRhpZero.ampnote'));
    const design = 'bridge_readout';
    const text = example('twoStageRhpZero.ampnote');
    expect(text).toContain(`design ${design}`);
    // The largest double formats as a value the language cannot read back.
    const huge = await edit({ uri, design, cc: Number.MAX_VALUE });
    expect(huge?.edits).toEqual([]);
    expect(huge?.refused).toMatch(/cc = 1\.80e\+308 lies outside/);
    // Far below any capacitor: the language refuses such magnitudes (docs/language.md).
    const tiny = await edit({ uri, design, cc: 1e-300 });
    expect(tiny?.edits).toEqual([]);
    expect(tiny?.refused).toMatch(/outside the values a design can hold/);
    const notANumber = await edit({ uri, design, cc: 1.5e-12, rz: 'big' });
    expect(notANumber?.refused).toMatch(/rz is not a finite number/);
    // A usable value is written as before.
    const fine = await edit({ uri, design, cc: 1.5e-12 });
    expect(fine?.refused).toBeUndefined();
    expect(fine?.edits).toHaveLength(1);
  });
});

describe('malformed input', () => {
  it('refuses rename to a name that is not a string', async () => {
    const uri = 'file:///virtual/rename.ampnote';
    client.open(uri, 'design d\n  param g = 1 mS\n  stage s gm = g rout = 1 Mohm cap = 1 pF\nend\n');
    const request = client.request('textDocument/rename', {
      textDocument: { uri },
      position: { line: 1, character: 9 },
      newName: null,
    });
    await expect(request).rejects.toMatchObject({ code: -32602 });
  });

  it('refuses an open whose text is not a string, once, and keeps serving', async () => {
    const uri = 'file:///virtual/not-text.ampnote';
    const before = client.logs.length;
    void client.connection.sendNotification('textDocument/didOpen', {
      textDocument: { uri, languageId: 'ampnote', version: 1, text: 42 },
    });
    for (let i = 0; i < 3; i++)
      expect(
        await client.request('textDocument/hover', {
          textDocument: { uri },
          position: { line: 0, character: 0 },
        }),
      ).toBeNull();
    const logged = await waitFor(
      () => {
        const lines = client.logs.slice(before).filter((l) => l.includes('not-text.ampnote'));
        return lines.length ? lines : undefined;
      },
      10_000,
      'the refusal in the log',
    );
    expect(logged).toHaveLength(1);
    expect(logged[0]).toMatch(/ignored didOpen .*: its text is not a string/);
    expect(client.logs.slice(before).join('\n')).not.toMatch(/TypeError/);
  });
});

describe('shutdown', () => {
  it('answers requests after shutdown with InvalidRequest', async () => {
    const { client: other } = await LspClient.start();
    try {
      const uri = 'file:///virtual/after.ampnote';
      other.open(uri, example('twoStageRhpZero.ampnote'));
      await other.diagnosticsFor(uri, 1);
      await other.request('shutdown', null);
      // LSP 3.17, shutdown: "If a server receives requests after a shutdown request those requests
      // should error with InvalidRequest" (-32600).
      for (const [method, params] of [
        ['textDocument/hover', { textDocument: { uri }, position: { line: 18, character: 4 } }],
        ['textDocument/documentSymbol', { textDocument: { uri } }],
        [
          'textDocument/codeAction',
          {
            textDocument: { uri },
            range: { start: { line: 0, character: 0 }, end: { line: 40, character: 0 } },
            context: { diagnostics: [] },
          },
        ],
        ['ampnote/panelData', { uri }],
      ] as const)
        await expect(other.request(method, params), method).rejects.toMatchObject({ code: -32600 });
    } finally {
      await other.connection.sendNotification('exit');
      await waitFor(() => (other.exited ? true : undefined), 10_000, 'exit').catch(() => other.proc.kill());
      other.connection.dispose();
    }
  });
});

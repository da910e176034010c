// The same server over Node IPC, as the VS Code client starts it.
import { fork } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { createMessageConnection, IPCMessageReader, IPCMessageWriter } from 'vscode-jsonrpc/node';
import type { PublishDiagnosticsParams } from 'vscode-languageserver-protocol';
import { ROOT, waitFor } from './lspClient';

describe('language server over --node-ipc', () => {
  it('initializes and publishes diagnostics', async () => {
    if (!existsSync(resolve(ROOT, 'dist/server.js')))
      execFileSync(process.execPath, ['scripts/build.mjs'], { cwd: ROOT });
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

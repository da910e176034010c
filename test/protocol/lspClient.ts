// A minimal LSP client for the protocol tests: spawns the built server over stdio, records what it
// publishes, answers its requests to the client, and polls for results instead of sleeping.
import { spawn, type ChildProcessWithoutNullStreams } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import { resolve } from 'node:path';
import {
  createMessageConnection,
  StreamMessageReader,
  StreamMessageWriter,
  type MessageConnection,
} from 'vscode-jsonrpc/node';
import type {
  Diagnostic,
  InitializeResult,
  PublishDiagnosticsParams,
  TextDocumentContentChangeEvent,
} from 'vscode-languageserver-protocol';

export const ROOT = resolve(__dirname, '../..');

export interface Published {
  readonly version?: number;
  readonly diagnostics: Diagnostic[];
  readonly at: number;
}

export class LspClient {
  readonly connection: MessageConnection;
  readonly published = new Map<string, Published[]>();
  readonly logs: string[] = [];
  readonly versions = new Map<string, number>();
  readonly texts = new Map<string, string>();
  configuration: unknown = {};
  exited = false;

  private constructor(readonly proc: ChildProcessWithoutNullStreams) {
    this.connection = createMessageConnection(
      new StreamMessageReader(proc.stdout),
      new StreamMessageWriter(proc.stdin),
    );
    this.connection.onNotification('textDocument/publishDiagnostics', (p: PublishDiagnosticsParams) => {
      const list = this.published.get(p.uri) ?? [];
      list.push({ version: p.version, diagnostics: p.diagnostics, at: Date.now() });
      this.published.set(p.uri, list);
    });
    this.connection.onNotification('window/logMessage', (p: { message: string }) => {
      this.logs.push(p.message);
    });
    this.connection.onRequest('workspace/configuration', (p: unknown) =>
      (p as { items: unknown[] }).items.map(() => this.configuration),
    );
    this.connection.onRequest('client/registerCapability', () => null);
    this.connection.onRequest('window/workDoneProgress/create', () => null);
    proc.on('exit', () => (this.exited = true));
    proc.stderr.on('data', (d: Buffer) => this.logs.push(d.toString()));
    this.connection.listen();
  }

  static async start(
    initializationOptions?: Record<string, unknown>,
  ): Promise<{ client: LspClient; init: InitializeResult; readyMs: number }> {
    const t0 = performance.now();
    const proc = spawn(process.execPath, [resolve(ROOT, 'dist/server.js'), '--stdio'], { cwd: ROOT });
    const client = new LspClient(proc);
    const init = (await client.connection.sendRequest('initialize', {
      processId: process.pid,
      rootUri: pathToFileURL(ROOT).href,
      ...(initializationOptions ? { initializationOptions } : {}),
      capabilities: {
        workspace: { configuration: true, didChangeConfiguration: { dynamicRegistration: true } },
        textDocument: { publishDiagnostics: { versionSupport: true, relatedInformation: true } },
      },
    })) as InitializeResult;
    const readyMs = performance.now() - t0;
    await client.connection.sendNotification('initialized', {});
    return { client, init, readyMs };
  }

  request<R>(method: string, params: unknown): Promise<R> {
    return this.connection.sendRequest(method, params) as Promise<R>;
  }

  open(uri: string, text: string): void {
    this.versions.set(uri, 1);
    this.texts.set(uri, text);
    void this.connection.sendNotification('textDocument/didOpen', {
      textDocument: { uri, languageId: 'ampnote', version: 1, text },
    });
  }

  openFile(path: string): string {
    const uri = pathToFileURL(resolve(ROOT, path)).href;
    this.open(uri, readFileSync(resolve(ROOT, path), 'utf8'));
    return uri;
  }

  /** Replace the whole text (a new version); returns the version sent. */
  change(uri: string, text: string): number {
    const version = (this.versions.get(uri) ?? 0) + 1;
    this.versions.set(uri, version);
    this.texts.set(uri, text);
    const changes: TextDocumentContentChangeEvent[] = [{ text }];
    void this.connection.sendNotification('textDocument/didChange', {
      textDocument: { uri, version },
      contentChanges: changes,
    });
    return version;
  }

  close(uri: string): void {
    void this.connection.sendNotification('textDocument/didClose', { textDocument: { uri } });
  }

  /** The latest diagnostics published for `uri` at `version` (waits for them). */
  diagnosticsFor(uri: string, version: number, timeoutMs = 20_000): Promise<Diagnostic[]> {
    return waitFor(
      () => this.published.get(uri)?.find((p) => p.version === version)?.diagnostics,
      timeoutMs,
      `diagnostics for ${uri}@${version}`,
    );
  }

  async stop(): Promise<void> {
    if (this.exited) return;
    try {
      await withTimeout(this.request('shutdown', null), 5000);
      await this.connection.sendNotification('exit');
    } catch {
      // The process is killed below either way.
    }
    await waitFor(() => (this.exited ? true : undefined), 5000, 'server exit').catch(() => this.proc.kill());
    this.connection.dispose();
  }
}

export async function waitFor<T>(probe: () => T | undefined, timeoutMs: number, what: string): Promise<T> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const v = probe();
    if (v !== undefined) return v;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 10));
  }
}

function withTimeout<T>(p: Promise<T>, ms: number): Promise<T> {
  return Promise.race([p, new Promise<T>((_, reject) => setTimeout(() => reject(new Error('timeout')), ms))]);
}

/** Apply LSP text edits to a text (edits must not overlap). */
export function applyEdits(
  text: string,
  edits: {
    range: { start: { line: number; character: number }; end: { line: number; character: number } };
    newText: string;
  }[],
): string {
  const lineStarts = [0];
  for (let i = 0; i < text.length; i++) if (text[i] === '\n') lineStarts.push(i + 1);
  const offset = (p: { line: number; character: number }) =>
    (lineStarts[p.line] ?? text.length) + p.character;
  const sorted = [...edits].sort((a, b) => offset(b.range.start) - offset(a.range.start));
  let out = text;
  for (const e of sorted)
    out = out.slice(0, offset(e.range.start)) + e.newText + out.slice(offset(e.range.end));
  return out;
}

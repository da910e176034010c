// Push diagnostics: debounced per document on the server, computed in slices, published for the version
// they were computed from, cleared on close. A document with sweeps is published twice: its ordinary
// findings as soon as they are ready, then again with the sweeps' (which take longer) once they have run;
// an edit in between cancels the sweeps.
import { CancellationTokenSource, type Connection, type Diagnostic } from 'vscode-languageserver';
import type { DocumentReport } from '../../../shared/src/report';
import { toDiagnostic } from '../convert';
import type { DocumentStore } from '../documentStore';
import type { Logger } from '../log';
import type { SettingsSource } from '../settings';

export function diagnosticsOf(report: DocumentReport, uri: string): Diagnostic[] {
  return report.findings.map((f, i) => toDiagnostic(f, uri, i));
}

export interface DiagnosticsScheduler {
  /** Validate after the debounce delay; a newer call for the same document replaces an older one. */
  schedule(uri: string, delayMs?: number): void;
  /** Stop pending work and clear the document's diagnostics. */
  close(uri: string): void;
  dispose(): void;
}

export function createDiagnosticsScheduler(
  connection: Connection,
  store: DocumentStore,
  settings: SettingsSource,
  log: Logger,
  debounceMs: () => number = () => 200,
  /** Called when a document's sweeps have run (the server refreshes the code lenses that show them). */
  onSwept: (uri: string) => void = () => undefined,
): DiagnosticsScheduler {
  const timers = new Map<string, NodeJS.Timeout>();
  const running = new Map<string, CancellationTokenSource>();

  const stop = (uri: string) => {
    const t = timers.get(uri);
    if (t) clearTimeout(t);
    timers.delete(uri);
    running.get(uri)?.cancel();
    running.delete(uri);
  };

  const run = async (uri: string) => {
    timers.delete(uri);
    const source = new CancellationTokenSource();
    running.set(uri, source);
    try {
      await settings.fetch(uri);
      if (source.token.isCancellationRequested) return;
      const done = await store.analyze(uri, source.token);
      if (!done || source.token.isCancellationRequested) return;
      await connection.sendDiagnostics({
        uri,
        version: done.document.version,
        diagnostics: diagnosticsOf(done.report, uri),
      });
      if (source.token.isCancellationRequested) return;
      const swept = await store.sweep(uri, source.token);
      if (!swept || swept.report === done.report || source.token.isCancellationRequested) return;
      await connection.sendDiagnostics({
        uri,
        version: swept.document.version,
        diagnostics: diagnosticsOf(swept.report, uri),
      });
      onSwept(uri);
    } catch (error) {
      log.error(`[diagnostics] ${error instanceof Error ? (error.stack ?? error.message) : String(error)}`);
    } finally {
      if (running.get(uri) === source) running.delete(uri);
      source.dispose();
    }
  };

  return {
    schedule(uri, delayMs = debounceMs()) {
      stop(uri);
      timers.set(
        uri,
        setTimeout(() => void run(uri), delayMs),
      );
    },
    close(uri) {
      stop(uri);
      void connection.sendDiagnostics({ uri, diagnostics: [] });
    },
    dispose() {
      for (const uri of [...timers.keys(), ...running.keys()]) stop(uri);
    },
  };
}

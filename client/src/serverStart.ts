// Starts the bundled language server over IPC, logs to one output channel, and restarts it after a crash a
// bounded number of times before telling the user and stopping.
import * as vscode from 'vscode';
import {
  CloseAction,
  ErrorAction,
  LanguageClient,
  State,
  TransportKind,
  type CloseHandlerResult,
  type ErrorHandler,
  type ErrorHandlerResult,
  type LanguageClientOptions,
  type ServerOptions,
} from 'vscode-languageclient/node';
import { boundedRestarts } from './restartPolicy';
import type { ServerRequests } from './requests';

const MAX_RESTARTS = 4;
const RESTART_WINDOW_MS = 3 * 60_000;

function restartingErrorHandler(output: vscode.OutputChannel): ErrorHandler {
  const policy = boundedRestarts(MAX_RESTARTS, RESTART_WINDOW_MS);
  return {
    error(error, _message, count): ErrorHandlerResult {
      output.appendLine(`[client] connection error (${count ?? 1}): ${error.message}`);
      // A few transient write/read errors are survivable; a stream that keeps failing is a dead server.
      return { action: (count ?? 1) <= 3 ? ErrorAction.Continue : ErrorAction.Shutdown, handled: true };
    },
    closed(): CloseHandlerResult {
      if (policy.shouldRestart(Date.now())) {
        output.appendLine(
          `[client] server stopped; restarting (${policy.recent} of ${MAX_RESTARTS} within 3 minutes)`,
        );
        return { action: CloseAction.Restart, handled: true };
      }
      output.appendLine('[client] server stopped too often; not restarting');
      void vscode.window
        .showErrorMessage(
          `The Ampnote server stopped ${policy.recent} times within 3 minutes and will not be restarted. ` +
            'Reload the window to try again; the log may say why.',
          'Show log',
        )
        .then((choice) => {
          if (choice === 'Show log') output.show(true);
        });
      return { action: CloseAction.DoNotRestart, handled: true };
    },
  };
}

export interface StartedServer extends ServerRequests {
  readonly client: LanguageClient;
  stop(): Promise<void>;
}

export async function startServer(
  context: vscode.ExtensionContext,
  output: vscode.LogOutputChannel,
): Promise<StartedServer> {
  const module = context.asAbsolutePath('dist/server.js');
  const serverOptions: ServerOptions = {
    run: { module, transport: TransportKind.ipc },
    debug: { module, transport: TransportKind.ipc, options: { execArgv: ['--nolazy', '--inspect=6019'] } },
  };
  const clientOptions: LanguageClientOptions = {
    documentSelector: [
      { scheme: 'file', language: 'ampnote' },
      { scheme: 'untitled', language: 'ampnote' },
    ],
    // Settings are pulled per document by the server; this notification tells it when to pull again.
    synchronize: { configurationSection: 'ampnote' },
    outputChannel: output,
    errorHandler: restartingErrorHandler(output),
  };
  const client = new LanguageClient('ampnote', 'Ampnote', serverOptions, clientOptions);
  await client.start();
  return {
    client,
    get isRunning() {
      return client.state === State.Running;
    },
    async request<P, R>(method: string, params: P, token?: vscode.CancellationToken): Promise<R> {
      if (client.state !== State.Running) throw new Error('the Ampnote server is not running');
      return token ? client.sendRequest<R>(method, params, token) : client.sendRequest<R>(method, params);
    },
    async stop() {
      if (client.state !== State.Stopped) await client.stop();
    },
  };
}

// Activation: start the language server, then the status bar, the panel host and the commands on top of it.
import * as vscode from 'vscode';
import { registerCommands } from './commands';
import { PanelHost } from './panelHost';
import { startServer, type StartedServer } from './serverStart';
import { registerStatusBar } from './statusBar';

let server: StartedServer | undefined;

export async function activate(context: vscode.ExtensionContext): Promise<void> {
  const output = vscode.window.createOutputChannel('Ampnote', { log: true });
  context.subscriptions.push(output);
  try {
    server = await startServer(context, output);
  } catch (err) {
    const text = err instanceof Error ? err.message : String(err);
    output.appendLine(`[client] the server did not start: ${text}`);
    void vscode.window
      .showErrorMessage(`Ampnote: the language server did not start (${text}).`, 'Show log')
      .then((c) => {
        if (c === 'Show log') output.show(true);
      });
    return;
  }
  const panel = new PanelHost(context, server, output);
  context.subscriptions.push(
    panel,
    registerStatusBar(server, output),
    registerCommands(server, panel, output),
  );
}

export async function deactivate(): Promise<void> {
  await server?.stop();
  server = undefined;
}

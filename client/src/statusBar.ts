// The status bar item: phase margin and unity-gain frequency of the design under the cursor, asked of the
// server after the cursor rests; hidden for editors of other languages.
import * as vscode from 'vscode';
import {
  DesignSummaryRequest,
  type DesignSummaryParams,
  type DesignSummaryResult,
} from '../../shared/src/protocol/requests';
import { formatDeg, formatHz } from '../../shared/src/format/si';
import type { ServerRequests } from './requests';

const REST_MS = 250;

export function summaryText(summary: NonNullable<DesignSummaryResult>): string {
  const pm = summary.phaseMarginDeg !== undefined ? `PM ${formatDeg(summary.phaseMarginDeg)}` : 'PM —';
  const ugf = summary.ugfHz !== undefined ? `UGF ${formatHz(summary.ugfHz)}` : 'UGF —';
  return `$(pulse) ${pm} · ${ugf}`;
}

export function registerStatusBar(server: ServerRequests, output: vscode.OutputChannel): vscode.Disposable {
  const item = vscode.window.createStatusBarItem('ampnote.summary', vscode.StatusBarAlignment.Right, 100);
  item.name = 'Ampnote design summary';
  item.command = 'ampnote.showPanel';
  let timer: NodeJS.Timeout | undefined;
  let pending: vscode.CancellationTokenSource | undefined;

  const update = async (editor: vscode.TextEditor | undefined) => {
    pending?.cancel();
    if (!editor || editor.document.languageId !== 'ampnote') {
      item.hide();
      return;
    }
    const cts = new vscode.CancellationTokenSource();
    pending = cts;
    const params: DesignSummaryParams = {
      uri: editor.document.uri.toString(),
      position: { line: editor.selection.active.line, character: editor.selection.active.character },
    };
    try {
      const summary = await server.request<DesignSummaryParams, DesignSummaryResult>(
        DesignSummaryRequest.method,
        params,
        cts.token,
      );
      if (cts.token.isCancellationRequested) return;
      if (!summary) {
        item.hide();
        return;
      }
      item.text = summaryText(summary);
      const tip = new vscode.MarkdownString();
      tip.appendText(`Design ${summary.design}`);
      if (summary.worstCorner) tip.appendText(`\nWorst corner: ${summary.worstCorner}`);
      tip.appendText('\nClick to open the pole-split panel.');
      item.tooltip = tip;
      item.show();
    } catch (err) {
      if (cts.token.isCancellationRequested) return;
      output.appendLine(`[status] ${err instanceof Error ? err.message : String(err)}`);
      item.text = '$(warning) Ampnote';
      item.tooltip = 'The design summary is not available (see the Ampnote output).';
      item.show();
    }
  };
  const schedule = (editor: vscode.TextEditor | undefined) => {
    if (timer) clearTimeout(timer);
    // No text editor in front (the panel or another view has the focus): keep what is shown.
    if (!editor) return;
    if (editor.document.languageId !== 'ampnote') {
      pending?.cancel();
      item.hide();
      return;
    }
    timer = setTimeout(() => void update(editor), REST_MS);
  };

  const subscriptions = [
    item,
    vscode.window.onDidChangeActiveTextEditor(schedule),
    vscode.window.onDidChangeTextEditorSelection((e) => schedule(e.textEditor)),
    vscode.workspace.onDidChangeTextDocument((e) => {
      const editor = vscode.window.activeTextEditor;
      if (editor && e.document === editor.document) schedule(editor);
    }),
    // A settings change can change the results (e.g. the settling tolerance).
    vscode.workspace.onDidChangeConfiguration((e) => {
      if (e.affectsConfiguration('ampnote')) schedule(vscode.window.activeTextEditor);
    }),
  ];
  schedule(vscode.window.activeTextEditor);
  return vscode.Disposable.from(...subscriptions, { dispose: () => timer && clearTimeout(timer) });
}

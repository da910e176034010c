// The commands under the "Ampnote" category: open the panel, list the file's designs with their findings,
// apply the preferred fix of the design at the cursor. Titles are in package.json; ids are an interface.
import * as vscode from 'vscode';
import {
  DesignSummaryRequest,
  SolveDesignRequest,
  type DesignSummaryParams,
  type DesignSummaryResult,
  type SolveDesignParams,
  type SolveDesignResult,
} from '../../shared/src/protocol/requests';
import type { PanelHost, ShowPanelArgs } from './panelHost';
import type { ServerRequests } from './requests';
import { summaryText } from './statusBar';

function activeAmpnoteEditor(): vscode.TextEditor | undefined {
  const editor = vscode.window.activeTextEditor;
  if (editor && editor.document.languageId === 'ampnote') return editor;
  void vscode.window.showInformationMessage('Ampnote: open an .ampnote file first.');
  return undefined;
}

/** Top-level document symbols are the file's designs (their children are stages, params, …). */
async function designSymbols(uri: vscode.Uri): Promise<vscode.DocumentSymbol[]> {
  const symbols = await vscode.commands.executeCommand<
    (vscode.DocumentSymbol | vscode.SymbolInformation)[] | undefined
  >('vscode.executeDocumentSymbolProvider', uri);
  return (symbols ?? []).filter((s): s is vscode.DocumentSymbol => 'children' in s);
}

function diagnosticCounts(uri: vscode.Uri, range: vscode.Range): string {
  const diags = vscode.languages.getDiagnostics(uri).filter((d) => range.intersection(d.range) !== undefined);
  const errors = diags.filter((d) => d.severity === vscode.DiagnosticSeverity.Error).length;
  const warnings = diags.filter((d) => d.severity === vscode.DiagnosticSeverity.Warning).length;
  if (errors + warnings === 0) return 'no errors or warnings';
  return [
    errors && `${errors} error${errors > 1 ? 's' : ''}`,
    warnings && `${warnings} warning${warnings > 1 ? 's' : ''}`,
  ]
    .filter(Boolean)
    .join(', ');
}

async function analyzeFile(server: ServerRequests, panel: PanelHost): Promise<void> {
  const editor = activeAmpnoteEditor();
  if (!editor) return;
  const uri = editor.document.uri;
  const designs = await designSymbols(uri);
  const anchors = designs.length > 0 ? designs.map((d) => d.selectionRange.start) : [editor.selection.active];
  const items: (vscode.QuickPickItem & { position: vscode.Position; design?: string })[] = [];
  for (const [i, position] of anchors.entries()) {
    const params: DesignSummaryParams = {
      uri: uri.toString(),
      position: { line: position.line, character: position.character },
    };
    const summary = await server.request<DesignSummaryParams, DesignSummaryResult>(
      DesignSummaryRequest.method,
      params,
    );
    const range = designs[i]?.range ?? new vscode.Range(position, position);
    items.push({
      label: summary?.design ?? designs[i]?.name ?? 'design',
      description: summary ? summaryText(summary).replace('$(pulse) ', '') : 'not analyzed',
      detail: designs[i] ? diagnosticCounts(uri, range) : undefined,
      position,
      design: summary?.design,
    });
  }
  // The Problems view lists every finding of the file with its place; the pick jumps to one design.
  await vscode.commands.executeCommand('workbench.actions.view.problems');
  const pick = await vscode.window.showQuickPick(items, {
    title: `Ampnote: ${items.length} design${items.length === 1 ? '' : 's'} in ${vscode.workspace.asRelativePath(uri)}`,
    placeHolder: 'Pick a design to open its pole-split panel',
  });
  if (!pick) return;
  const shown = await vscode.window.showTextDocument(editor.document, editor.viewColumn);
  shown.selection = new vscode.Selection(pick.position, pick.position);
  shown.revealRange(
    new vscode.Range(pick.position, pick.position),
    vscode.TextEditorRevealType.InCenterIfOutsideViewport,
  );
  panel.show({ uri: uri.toString(), design: pick.design });
}

async function applySuggestedCompensation(): Promise<void> {
  const editor = activeAmpnoteEditor();
  if (!editor) return;
  const uri = editor.document.uri;
  const cursor = editor.selection.active;
  // Quick fixes hang on findings, which sit on the element to change, not necessarily under the cursor:
  // ask for the actions over the whole design that holds the cursor.
  const design = (await designSymbols(uri)).find((d) => d.range.contains(cursor));
  const range = design?.range ?? editor.document.lineAt(cursor.line).range;
  const actions =
    (await vscode.commands.executeCommand<(vscode.CodeAction | vscode.Command)[] | undefined>(
      'vscode.executeCodeActionProvider',
      uri,
      range,
      vscode.CodeActionKind.QuickFix.value,
    )) ?? [];
  // Disabled actions only say why no value meets a rule: nothing to apply.
  const fixes = actions.filter(
    (a): a is vscode.CodeAction =>
      'title' in a && !('command' in a && typeof a.command === 'string') && !('disabled' in a && a.disabled),
  );
  let chosen = fixes.find((a) => a.isPreferred);
  if (!chosen && fixes.length > 0) {
    const pick = await vscode.window.showQuickPick(
      fixes.map((a) => ({ label: a.title, action: a })),
      { placeHolder: 'No fix is marked as preferred here; pick one to apply' },
    );
    chosen = pick?.action;
  }
  if (!chosen) {
    if (fixes.length === 0)
      void vscode.window.showInformationMessage(
        `Ampnote: no fix is offered for ${design ? `design ${design.name}` : 'this line'}.`,
      );
    return;
  }
  if (chosen.edit) await vscode.workspace.applyEdit(chosen.edit);
  if (chosen.command)
    await vscode.commands.executeCommand(chosen.command.command, ...(chosen.command.arguments ?? []));
}

/**
 * Solves the free parameters of a design (from its code lens, or the design at the cursor) and writes the
 * answer as one ordinary, undoable edit; says what was solved, or why nothing meets every requirement.
 */
async function solveFreeParameters(
  server: ServerRequests,
  args?: { uri?: unknown; design?: unknown },
): Promise<void> {
  let uri = typeof args?.uri === 'string' ? vscode.Uri.parse(args.uri) : undefined;
  let design = typeof args?.design === 'string' ? args.design : undefined;
  if (!uri || !design) {
    const editor = activeAmpnoteEditor();
    if (!editor) return;
    uri = editor.document.uri;
    design = (await designSymbols(uri)).find((d) => d.range.contains(editor.selection.active))?.name;
    if (!design) {
      void vscode.window.showInformationMessage(
        'Ampnote: put the cursor in a design that has free parameters.',
      );
      return;
    }
  }
  const result = await vscode.window.withProgress(
    {
      location: vscode.ProgressLocation.Notification,
      title: `Ampnote: solving the free parameters of ${design}…`,
    },
    () =>
      server.request<SolveDesignParams, SolveDesignResult>(SolveDesignRequest.method, {
        uri: uri.toString(),
        design,
      }),
  );
  if (!result) return;
  if (result.status !== 'met' || result.edits.length === 0) {
    void vscode.window.showWarningMessage(`Ampnote: ${result.summary}`);
    return;
  }
  const edit = new vscode.WorkspaceEdit();
  for (const e of result.edits)
    edit.replace(
      uri,
      new vscode.Range(e.range.start.line, e.range.start.character, e.range.end.line, e.range.end.character),
      e.newText,
    );
  await vscode.workspace.applyEdit(edit);
  void vscode.window.showInformationMessage(`Ampnote: ${result.summary}`);
}

export function registerCommands(
  server: ServerRequests,
  panel: PanelHost,
  output: vscode.OutputChannel,
): vscode.Disposable {
  const guard =
    (name: string, fn: (...args: never[]) => Promise<void> | void) =>
    async (...args: never[]) => {
      try {
        await fn(...args);
      } catch (err) {
        const text = err instanceof Error ? err.message : String(err);
        output.appendLine(`[${name}] ${text}`);
        void vscode.window.showErrorMessage(`Ampnote: ${text}`);
      }
    };
  return vscode.Disposable.from(
    vscode.commands.registerCommand(
      'ampnote.showPanel',
      guard('showPanel', (args?: ShowPanelArgs) =>
        panel.show(args && typeof args === 'object' ? args : undefined),
      ),
    ),
    vscode.commands.registerCommand(
      'ampnote.analyzeFile',
      guard('analyzeFile', () => analyzeFile(server, panel)),
    ),
    vscode.commands.registerCommand(
      'ampnote.solveFreeParameters',
      guard('solveFreeParameters', (args?: { uri?: unknown; design?: unknown }) =>
        solveFreeParameters(server, args),
      ),
    ),
    vscode.commands.registerCommand(
      'ampnote.applySuggestedCompensation',
      guard('applySuggestedCompensation', applySuggestedCompensation),
    ),
  );
}

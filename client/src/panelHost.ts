// Hosts the pole-split webview: follows the active editor and the design under the cursor, asks the server
// for PanelData (with the sliders' values), writes an applied value as an ordinary undoable edit, and saves
// exported charts where the user chooses.
import { randomBytes } from 'node:crypto';
import * as vscode from 'vscode';
import type { CompensationTarget, PanelData } from '../../shared/src/protocol/panelData';
import {
  CompensationEditRequest,
  DesignSummaryRequest,
  type DesignSummaryParams,
  type DesignSummaryResult,
  PanelDataRequest,
  SolveDesignRequest,
  type SolveDesignParams,
  type SolveDesignResult,
  type CompensationEditParams,
  type CompensationEditResult,
  type PanelDataParams,
  type PanelDataResult,
} from '../../shared/src/protocol/requests';
import type { HostToWebview, PanelState } from '../../shared/src/protocol/webviewMessages';
import { panelHtml } from './panelHtml';
import { chart as chartDescriptor, isChartId, type ChartId } from '../../shared/src/charts/descriptors';
import { applyRefusal, parseWebviewMessage } from './webviewGuard';
import type { ServerRequests } from './requests';

const sameTarget = (a: CompensationTarget, b: CompensationTarget) => a.kind === b.kind && a.index === b.index;

export const PANEL_VIEW_TYPE = 'ampnote.polePanel';
const FOLLOW_MS = 200;
const EDIT_MS = 350;

export interface ShowPanelArgs {
  readonly uri?: string;
  readonly design?: string;
}

interface Target {
  readonly uri: string;
  /** Set when the panel was opened for a named design (code lens); otherwise the cursor decides. */
  design?: string;
  position?: { line: number; character: number };
}

export class PanelHost implements vscode.Disposable {
  private panel: vscode.WebviewPanel | undefined;
  private target: Target | undefined;
  /** Slider values for the design shown: Cc and Rz, or the free parameters' by name. */
  private overrides: { cc?: number; rz?: number; free?: Readonly<Record<string, number>> } = {};
  /** The element the user chose to sweep (absent: the design's first); belongs to the design shown. */
  private choice: CompensationTarget | undefined;
  /** Set by `show`: the next request may choose the element under the cursor. */
  private preselectAt: { line: number; character: number } | undefined;
  private inFlightPreselect: { line: number; character: number } | undefined;
  private last: PanelData | null = null;
  private inFlight: vscode.CancellationTokenSource | undefined;
  private timer: NodeJS.Timeout | undefined;
  /** Set while a refresh is pending: true when only cursor moves asked for it. */
  private onlyCursorMoved: boolean | undefined;
  /** Something changed while the panel was hidden. */
  private staleWhileHidden = false;
  /** The document version the shown data was computed for. */
  private lastVersion: number | undefined;
  private readonly subscriptions: vscode.Disposable[] = [];

  constructor(
    private readonly context: vscode.ExtensionContext,
    private readonly server: ServerRequests,
    private readonly output: vscode.OutputChannel,
  ) {
    this.subscriptions.push(
      vscode.window.onDidChangeActiveTextEditor((editor) => {
        if (editor && editor.document.languageId === 'ampnote') this.follow(editor, FOLLOW_MS);
      }),
      vscode.window.onDidChangeTextEditorSelection((e) => {
        if (e.textEditor.document.languageId === 'ampnote') this.follow(e.textEditor, FOLLOW_MS);
      }),
      vscode.workspace.onDidChangeTextDocument((e) => {
        if (this.target && e.document.uri.toString() === this.target.uri && e.contentChanges.length > 0)
          this.schedule(EDIT_MS);
      }),
      vscode.workspace.onDidChangeConfiguration((e) => {
        if (e.affectsConfiguration('ampnote')) this.schedule(EDIT_MS);
      }),
      vscode.window.onDidChangeActiveColorTheme(() => this.post({ type: 'theme' })),
      vscode.window.registerWebviewPanelSerializer(PANEL_VIEW_TYPE, {
        deserializeWebviewPanel: async (panel, state: unknown) => {
          this.adopt(panel);
          const saved = state && typeof state === 'object' ? (state as Partial<PanelState>) : undefined;
          // After a reload the restored panel often has the focus (no active text editor): show the design
          // it showed before, and let the cursor take over from there.
          const editor =
            vscode.window.activeTextEditor ??
            vscode.window.visibleTextEditors.find((e) => e.document.languageId === 'ampnote');
          if (typeof saved?.uri === 'string') {
            this.setTarget({
              uri: saved.uri,
              design: typeof saved.design === 'string' ? saved.design : undefined,
            });
            const kept = parseWebviewMessage({ type: 'compensation', target: saved.compensation });
            if (kept?.type === 'compensation') this.choice = kept.target;
            this.schedule(0);
          } else if (editor && editor.document.languageId === 'ampnote') {
            this.follow(editor, 0);
          }
          if (saved && isChartId(saved.selected)) this.post({ type: 'restore', state: saved as PanelState });
        },
      }),
    );
  }

  show(args?: ShowPanelArgs): void {
    const editor = vscode.window.activeTextEditor;
    if (args?.uri) {
      const position =
        editor && editor.document.uri.toString() === args.uri ? editor.selection.active : undefined;
      this.setTarget({
        uri: args.uri,
        design: args.design,
        position: position && { line: position.line, character: position.character },
      });
      this.preselectAt = position && { line: position.line, character: position.character };
    } else if (editor && editor.document.languageId === 'ampnote') {
      const p = editor.selection.active;
      this.setTarget({
        uri: editor.document.uri.toString(),
        position: { line: p.line, character: p.character },
      });
      this.preselectAt = { line: p.line, character: p.character };
    }
    if (this.panel) {
      this.panel.reveal(this.panel.viewColumn ?? vscode.ViewColumn.Beside, true);
    } else {
      const panel = vscode.window.createWebviewPanel(
        PANEL_VIEW_TYPE,
        'Pole split',
        { viewColumn: vscode.ViewColumn.Beside, preserveFocus: true },
        {
          enableScripts: true,
          retainContextWhenHidden: true,
          localResourceRoots: [this.mediaRoot()],
        },
      );
      this.adopt(panel);
    }
    this.schedule(0);
  }

  dispose(): void {
    if (this.timer) clearTimeout(this.timer);
    this.inFlight?.cancel();
    this.panel?.dispose();
    for (const d of this.subscriptions) d.dispose();
  }

  private mediaRoot(): vscode.Uri {
    return vscode.Uri.joinPath(this.context.extensionUri, 'client', 'media');
  }

  private adopt(panel: vscode.WebviewPanel): void {
    this.panel = panel;
    const webview = panel.webview;
    webview.options = { enableScripts: true, localResourceRoots: [this.mediaRoot()] };
    panel.iconPath = vscode.Uri.joinPath(this.mediaRoot(), 'icon.png');
    webview.html = panelHtml({
      nonce: randomBytes(16).toString('hex'),
      cspSource: webview.cspSource,
      scriptUri: webview.asWebviewUri(vscode.Uri.joinPath(this.mediaRoot(), 'panel.js')).toString(),
      styleUri: webview.asWebviewUri(vscode.Uri.joinPath(this.mediaRoot(), 'panel.css')).toString(),
    });
    const messages = webview.onDidReceiveMessage((raw) => void this.onMessage(raw));
    const shown = panel.onDidChangeViewState((e) => {
      if (e.webviewPanel.visible && this.staleWhileHidden) {
        this.staleWhileHidden = false;
        this.schedule(0);
      }
    });
    panel.onDidDispose(() => {
      messages.dispose();
      shown.dispose();
      this.inFlight?.cancel();
      this.panel = undefined;
    });
  }

  private setTarget(next: Target): void {
    const sameDocument = this.target?.uri === next.uri;
    if (!sameDocument || (next.design !== undefined && next.design !== this.last?.design)) {
      this.overrides = {};
      this.choice = undefined;
    }
    this.target = next;
  }

  private follow(editor: vscode.TextEditor, delay: number): void {
    if (!this.panel) return;
    const p = editor.selection.active;
    // Moving the cursor lets the cursor choose the design again (a code lens only chose the first one).
    this.setTarget({
      uri: editor.document.uri.toString(),
      position: { line: p.line, character: p.character },
    });
    this.schedule(delay, true);
  }

  /** `cursorOnly`: nothing but the cursor moved, so the panel may be current already (see refresh). */
  private schedule(delay: number, cursorOnly = false): void {
    if (!this.panel) return;
    if (!this.panel.visible) {
      // A hidden panel keeps its page (and state); it catches up once it is shown again.
      this.staleWhileHidden = true;
      return;
    }
    if (this.timer) clearTimeout(this.timer);
    this.onlyCursorMoved = cursorOnly && this.onlyCursorMoved !== false;
    this.timer = setTimeout(() => {
      const cursor = this.onlyCursorMoved === true;
      this.onlyCursorMoved = undefined;
      void this.refresh(cursor);
    }, delay);
  }

  private documentVersion(uri: string): number | undefined {
    return vscode.workspace.textDocuments.find((d) => d.uri.toString() === uri)?.version;
  }

  /**
   * After a cursor move in the same, unchanged document: true when the cursor is still in the design shown
   * (or in no design at all).
   * The summary request reads the server's cached analysis, far cheaper than a new panel (with its sweep).
   */
  private async stillShown(target: Target): Promise<boolean> {
    const last = this.last;
    if (!last || !target.position || last.uri !== target.uri) return false;
    if (this.lastVersion === undefined || this.documentVersion(target.uri) !== this.lastVersion) return false;
    try {
      const summary = await this.server.request<DesignSummaryParams, DesignSummaryResult>(
        DesignSummaryRequest.method,
        { uri: target.uri, position: target.position },
      );
      // Outside every design (a comment between two) the panel keeps the design it shows.
      return summary === null || summary.design === last.design;
    } catch {
      return false;
    }
  }

  private post(message: HostToWebview): void {
    void this.panel?.webview.postMessage(message);
  }

  private async refresh(cursorOnly = false): Promise<void> {
    const target = this.target;
    if (!this.panel || !target) {
      this.post({ type: 'data', data: null });
      return;
    }
    if (cursorOnly && (await this.stillShown(target))) return;
    // A request cancelled before it answered hands its pre-selection on to the one replacing it.
    const preselect = this.preselectAt ?? this.inFlightPreselect;
    this.preselectAt = undefined;
    this.inFlight?.cancel();
    const cts = new vscode.CancellationTokenSource();
    this.inFlight = cts;
    this.inFlightPreselect = preselect;
    const version = this.documentVersion(target.uri);
    const params: PanelDataParams = {
      uri: target.uri,
      design: target.design,
      position: target.design === undefined ? target.position : undefined,
      cc: this.overrides.cc,
      rz: this.overrides.rz,
      ...(this.choice ? { compensation: this.choice } : {}),
      ...(preselect ? { compensationAt: preselect } : {}),
      ...(this.overrides.free ? { free: this.overrides.free } : {}),
    };
    try {
      const data = await this.server.request<PanelDataParams, PanelDataResult>(
        PanelDataRequest.method,
        params,
        cts.token,
      );
      if (cts.token.isCancellationRequested) return;
      this.inFlightPreselect = undefined;
      if (data && this.last && (data.design !== this.last.design || data.uri !== this.last.uri)) {
        // Another design came under the cursor: slider values and the chosen element belong to the
        // previous one.
        const moved =
          this.overrides.cc !== undefined || this.overrides.rz !== undefined || this.overrides.free;
        if (moved || this.choice) {
          this.overrides = {};
          this.choice = undefined;
          this.last = data;
          this.preselectAt = preselect;
          this.schedule(0);
          return;
        }
      }
      if (preselect && data?.compensation) {
        // The element under the cursor (or else the one shown) is kept as the choice for this design.
        const picked = { kind: data.compensation.kind, index: data.compensation.index };
        const sameDesign = this.last?.design === data.design && this.last?.uri === data.uri;
        const before = this.choice ?? (sameDesign ? this.last?.compensation : undefined);
        const first = data.compensationChoices?.[0];
        if (this.choice !== undefined || !first || !sameTarget(picked, first)) this.choice = picked;
        // Slider values belong to the element they moved, not to the one the cursor picked now.
        const moved = this.overrides.cc !== undefined || this.overrides.rz !== undefined;
        if (moved && before && !sameTarget(before, picked)) {
          this.overrides = {};
          this.last = data;
          this.schedule(0);
          return;
        }
      }
      this.last = data;
      this.lastVersion = version;
      if (this.panel) this.panel.title = data ? `Pole split: ${data.design}` : 'Pole split';
      this.post({ type: 'data', data });
    } catch (err) {
      if (cts.token.isCancellationRequested) return;
      this.inFlightPreselect = undefined;
      const text = err instanceof Error ? err.message : String(err);
      this.output.appendLine(`[panel] ${text}`);
      this.post({ type: 'status', text: `Could not compute the panel: ${text}`, error: true });
    }
  }

  private async onMessage(raw: unknown): Promise<void> {
    const msg = parseWebviewMessage(raw);
    if (!msg) {
      this.output.appendLine('[panel] ignored a malformed message from the webview');
      return;
    }
    switch (msg.type) {
      case 'ready':
        this.schedule(0);
        return;
      case 'slider':
        this.overrides = { cc: msg.cc, rz: msg.rz };
        this.schedule(0);
        return;
      case 'apply':
        await this.apply(msg.cc, msg.rz);
        return;
      case 'free':
        this.overrides = { free: msg.values };
        this.schedule(0);
        return;
      case 'solve':
        await this.solve();
        return;
      case 'applyFree':
        await this.applyFree(msg.values);
        return;
      case 'compensation':
        // Slider values belong to the element they moved.
        this.choice = msg.target;
        this.overrides = {};
        // The user's choice stands over an earlier pre-selection still on its way.
        this.preselectAt = undefined;
        this.inFlightPreselect = undefined;
        this.schedule(0);
        return;
      case 'exportPng':
        await this.save(
          msg.chart,
          'png',
          Buffer.from(msg.dataUrl.slice('data:image/png;base64,'.length), 'base64'),
        );
        return;
      case 'exportCsv':
        await this.save(msg.chart, 'csv', Buffer.from(msg.csv, 'utf8'));
        return;
    }
  }

  /** Tell the user why nothing was written: a notification, and the panel's status line. */
  private refuse(design: string, why: string): void {
    const text = `The values were not written into design ${design}: ${why}.`;
    this.output.appendLine(`[panel] apply: ${text}`);
    this.post({ type: 'status', text, error: true });
    void vscode.window.showWarningMessage(`Ampnote: ${text}`);
  }

  private async apply(cc: number | undefined, rz: number | undefined): Promise<void> {
    const data = this.last;
    if (!data) return;
    const why = applyRefusal(cc, rz);
    if (why) return this.refuse(data.design, why);
    // Into the element the panel shows, whose sliders made these values.
    const params: CompensationEditParams = {
      uri: data.uri,
      design: data.design,
      cc,
      rz,
      ...(data.compensation
        ? { compensation: { kind: data.compensation.kind, index: data.compensation.index } }
        : {}),
    };
    try {
      const result = await this.server.request<CompensationEditParams, CompensationEditResult>(
        CompensationEditRequest.method,
        params,
      );
      if (result?.refused) return this.refuse(data.design, result.refused);
      if (!result || result.edits.length === 0) {
        void vscode.window.showWarningMessage(
          `Ampnote: the values could not be written into design ${data.design}.`,
        );
        return;
      }
      const uri = vscode.Uri.parse(data.uri);
      const edit = new vscode.WorkspaceEdit();
      for (const e of result.edits) {
        edit.replace(
          uri,
          new vscode.Range(
            e.range.start.line,
            e.range.start.character,
            e.range.end.line,
            e.range.end.character,
          ),
          e.newText,
        );
      }
      if (await vscode.workspace.applyEdit(edit)) {
        this.overrides = {};
        this.schedule(EDIT_MS);
      }
    } catch (err) {
      const text = err instanceof Error ? err.message : String(err);
      this.output.appendLine(`[panel] apply: ${text}`);
      void vscode.window.showErrorMessage(`Ampnote: could not write the values: ${text}`);
    }
  }

  /** Solves the shown design's free parameters and moves the sliders to the answer (the file is unchanged). */
  private async solve(): Promise<void> {
    const data = this.last;
    if (!data?.free) return;
    try {
      const result = await this.server.request<SolveDesignParams, SolveDesignResult>(
        SolveDesignRequest.method,
        { uri: data.uri, design: data.design },
      );
      if (!result || !result.values?.length) {
        this.post({ type: 'status', text: result?.summary ?? 'Nothing to solve.', error: true });
        return;
      }
      this.overrides = { free: Object.fromEntries(result.values.map((v) => [v.name, v.value])) };
      await this.refresh();
      // After the data (which clears the status line): what was solved, or what cannot be met together.
      this.post({ type: 'status', text: result.summary, error: result.status !== 'met' });
    } catch (err) {
      const text = err instanceof Error ? err.message : String(err);
      this.output.appendLine(`[panel] solve: ${text}`);
      this.post({ type: 'status', text: `Could not solve: ${text}`, error: true });
    }
  }

  /**
   * Writes the free values the sliders show as one undoable edit of the free parameters' literals (the
   * solve's edit form). The values are evaluated for the current text first, so what is written is what
   * the panel has checked.
   */
  private async applyFree(values: Readonly<Record<string, number>>): Promise<void> {
    if (!this.last?.free) return;
    this.overrides = { free: values };
    await this.refresh();
    const data = this.last;
    const free = data?.free;
    if (!data || !free) return;
    if (free.refused) return this.refuse(data.design, free.refused);
    const shown = free.sliders.every((s) => (values[s.name] ?? s.written) === s.value);
    if (!shown) return this.refuse(data.design, 'the panel shows other values than these; try again');
    if (free.edits.length === 0) return this.refuse(data.design, 'these are the values as written');
    if (this.lastVersion === undefined || this.documentVersion(data.uri) !== this.lastVersion)
      return this.refuse(data.design, 'the file changed meanwhile; try again');
    const uri = vscode.Uri.parse(data.uri);
    const edit = new vscode.WorkspaceEdit();
    for (const e of free.edits) {
      const { start, end } = e.range;
      edit.replace(uri, new vscode.Range(start.line, start.character, end.line, end.character), e.newText);
    }
    try {
      if (await vscode.workspace.applyEdit(edit)) {
        this.overrides = {};
        this.schedule(EDIT_MS);
      }
    } catch (err) {
      const text = err instanceof Error ? err.message : String(err);
      this.output.appendLine(`[panel] apply: ${text}`);
      void vscode.window.showErrorMessage(`Ampnote: could not write the values: ${text}`);
    }
  }

  private async save(chart: ChartId, ext: 'png' | 'csv', bytes: Uint8Array): Promise<void> {
    const data = this.last;
    const base = data ? vscode.Uri.parse(data.uri) : undefined;
    const name = `${(data?.design ?? 'design').replace(/[^\w.-]+/g, '_')}-${chartDescriptor(chart).fileName}.${ext}`;
    const folder =
      base && base.scheme === 'file'
        ? vscode.Uri.joinPath(base, '..')
        : vscode.workspace.workspaceFolders?.[0]?.uri;
    const target = await vscode.window.showSaveDialog({
      defaultUri: folder ? vscode.Uri.joinPath(folder, name) : undefined,
      filters: ext === 'png' ? { 'PNG image': ['png'] } : { 'CSV table': ['csv'] },
      saveLabel: ext === 'png' ? 'Save chart' : 'Save data',
    });
    if (!target) return;
    try {
      await vscode.workspace.fs.writeFile(target, bytes);
    } catch (err) {
      void vscode.window.showErrorMessage(
        `Ampnote: could not save ${target.fsPath}: ${err instanceof Error ? err.message : String(err)}`,
      );
    }
  }
}

// The Ampnote language server: an adapter from LSP to the core's analyzeDocument. Every method the server
// answers is registered below, one line each. Runs over stdio (`--stdio`) or IPC (`--node-ipc`).
import {
  createConnection,
  DidChangeConfigurationNotification,
  ProposedFeatures,
  TextDocuments,
  TextDocumentSyncKind,
  type CancellationToken,
  type CodeActionParams,
  type CodeLensParams,
  type CompletionParams,
  type DefinitionParams,
  type HoverParams,
  type InitializeResult,
  type InlayHintParams,
  type PrepareRenameParams,
  type RenameParams,
} from 'vscode-languageserver/node';
import { TextDocument } from 'vscode-languageserver-textdocument';
import {
  CompensationEditRequest,
  DesignSummaryRequest,
  PanelDataRequest,
  type CompensationEditParams,
  type DesignSummaryParams,
  type PanelDataParams,
} from '../../shared/src/protocol/requests';
import { DocumentStore, type Analysed } from './documentStore';
import { codeActions } from './features/codeActions';
import { codeLenses } from './features/codeLens';
import { completion } from './features/completion';
import { compensationEdit, designSummary, panelData } from './features/custom';
import { definition } from './features/definition';
import { createDiagnosticsScheduler } from './features/diagnostics';
import { hover } from './features/hover';
import { inlayHints } from './features/inlayHints';
import { prepareRename, rename } from './features/rename';
import { documentSymbols } from './features/symbols';
import { guarded } from './log';
import { createSettingsSource } from './settings';

const connection = createConnection(ProposedFeatures.all);
const documents = new TextDocuments(TextDocument);
const log = connection.console;

let canAskConfiguration = false;
let canRegisterConfiguration = false;
const settings = createSettingsSource(connection, () => canAskConfiguration);
const store = new DocumentStore(
  (uri) => documents.get(uri),
  (uri) => settings.known(uri),
);
const diagnostics = createDiagnosticsScheduler(connection, store, settings, log);

/** The analysed current version of a document named by a request, if it is open. */
const analysed = (params: unknown): Analysed | undefined => {
  const uri =
    (params as { textDocument?: { uri?: unknown }; uri?: unknown } | undefined)?.textDocument?.uri ??
    (params as { uri?: unknown })?.uri;
  return typeof uri === 'string' ? store.current(uri) : undefined;
};
/** A feature run on the document its request names (guarded; `fallback` when the document is not open). */
const on =
  <P, R>(feature: string, fallback: R, run: (a: Analysed, p: P, token: CancellationToken) => R) =>
  (p: P, token: CancellationToken) =>
    guarded(log, feature, fallback, () => {
      const a = analysed(p);
      return a ? run(a, p, token) : fallback;
    })();
const position = (params: unknown) => {
  const p = (params as { position?: { line?: unknown; character?: unknown } }).position;
  if (!p || !Number.isInteger(p.line) || !Number.isInteger(p.character))
    throw new Error('the request has no valid position');
  return p as { line: number; character: number };
};

connection.onInitialize((params): InitializeResult => {
  canAskConfiguration = !!params.capabilities.workspace?.configuration;
  canRegisterConfiguration = !!params.capabilities.workspace?.didChangeConfiguration?.dynamicRegistration;
  return {
    capabilities: {
      textDocumentSync: { openClose: true, change: TextDocumentSyncKind.Incremental },
      hoverProvider: true,
      inlayHintProvider: true,
      codeActionProvider: { codeActionKinds: ['quickfix'] },
      codeLensProvider: { resolveProvider: false },
      completionProvider: { triggerCharacters: [' ', '.'] },
      documentSymbolProvider: true,
      definitionProvider: true,
      renameProvider: { prepareProvider: true },
    },
    serverInfo: { name: 'ampnote', version: '0.1.0' },
  };
});
connection.onInitialized(() => {
  if (canRegisterConfiguration)
    void connection.client.register(DidChangeConfigurationNotification.type, { section: 'ampnote' });
});

// Document lifecycle and settings.
documents.onDidOpen((e) => diagnostics.schedule(e.document.uri, 0));
documents.onDidChangeContent((e) => diagnostics.schedule(e.document.uri));
documents.onDidClose(
  (e) => (diagnostics.close(e.document.uri), store.evict(e.document.uri), settings.forget(e.document.uri)),
);
connection.onDidChangeConfiguration((change) => {
  settings.clear();
  if (!canAskConfiguration) settings.setPushed(change.settings);
  store.invalidateAll();
  for (const doc of documents.all()) diagnostics.schedule(doc.uri, 0);
});

// Editor features and the extension's own requests: one line per method.
// prettier-ignore
{
connection.onHover(on('hover', null, (a, p: HoverParams) => hover(a.report, position(p))));
connection.languages.inlayHint.on(on('inlayHints', [], (a, p: InlayHintParams) => inlayHints(a.report, a.document, p.range)));
connection.onCodeAction(on('codeActions', [], (a, p: CodeActionParams) => codeActions(a.report, p)));
connection.onCodeLens(on('codeLens', [], (a, p: CodeLensParams) => codeLenses(a.report, p.textDocument.uri)));
connection.onCompletion(on('completion', [], (a, p: CompletionParams) => completion(a.report, a.document, position(p))));
connection.onDocumentSymbol(on('documentSymbols', [], (a) => documentSymbols(a.report)));
connection.onDefinition(on('definition', null, (a, p: DefinitionParams) => definition(a.report, p.textDocument.uri, position(p))));
connection.onPrepareRename(on('prepareRename', null, (a, p: PrepareRenameParams) => prepareRename(a.report, position(p))));
connection.onRenameRequest(on('rename', null, (a, p: RenameParams) => rename(a.report, p.textDocument.uri, position(p), p.newName)));
connection.onRequest(PanelDataRequest.method, on('panelData', null, (a, p: PanelDataParams, token) => panelData(a.report, p, settings.known(p.uri), token)));
connection.onRequest(DesignSummaryRequest.method, on('designSummary', null, (a, p: DesignSummaryParams) => designSummary(a.report, p)));
connection.onRequest(CompensationEditRequest.method, on('compensationEdit', null, (a, p: CompensationEditParams) => compensationEdit(a.report, p)));
}

connection.onShutdown(() => diagnostics.dispose());
documents.listen(connection);
connection.listen();

// The Ampnote language server: an adapter from LSP to the core's analyzeDocument. Every method the server
// answers is registered below, one line each. Runs over stdio (`--stdio`) or IPC (`--node-ipc`).
import {
  CodeLensRefreshRequest,
  createConnection,
  DidChangeConfigurationNotification,
  ErrorCodes,
  ProposedFeatures,
  ResponseError,
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
  SolveDesignRequest,
  type CompensationEditParams,
  type DesignSummaryParams,
  type PanelDataParams,
  type SolveDesignParams,
} from '../../shared/src/protocol/requests';
import { DocumentStore, type Analyzed } from './documentStore';
import { cancelled, codeActions } from './features/codeActions';
import { codeLenses } from './features/codeLens';
import { completion } from './features/completion';
import { compensationEdit, designSummary, panelData, solveDesignRequest } from './features/custom';
import { definition } from './features/definition';
import { createDiagnosticsScheduler } from './features/diagnostics';
import { hover } from './features/hover';
import { inlayHints } from './features/inlayHints';
import { prepareRename, rename } from './features/rename';
import { documentSymbols } from './features/symbols';
import { checkedDocumentSync } from './documentSync';
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
/** Validation waits this long after an edit; a client may choose another delay when it initializes. */
let validationDelayMs = 200;
/** The client asks for code lenses again when told to (the sweep lenses arrive after the sweeps run). */
let canRefreshCodeLens = false;
const diagnostics = createDiagnosticsScheduler(
  connection,
  store,
  settings,
  log,
  () => validationDelayMs,
  () => {
    if (canRefreshCodeLens) void connection.sendRequest(CodeLensRefreshRequest.type).catch(() => undefined);
  },
);

/** After `shutdown` the protocol allows only `exit`: every other request is an invalid request. */
let shutDown = false;
const refuseAfterShutdown = () => {
  if (shutDown) throw new ResponseError(ErrorCodes.InvalidRequest, 'the server is shutting down');
};

/** The URI a request names (`textDocument.uri`, or `uri` for the extension's own requests). */
const uriOf = (params: unknown): string | undefined => {
  const uri =
    (params as { textDocument?: { uri?: unknown }; uri?: unknown } | undefined)?.textDocument?.uri ??
    (params as { uri?: unknown } | undefined)?.uri;
  return typeof uri === 'string' ? uri : undefined;
};
/** A feature run on the document its request names (guarded; `fallback` when the document is not open). */
const on =
  <P, R>(feature: string, fallback: R, run: (a: Analyzed, p: P, token: CancellationToken) => R) =>
  (p: P, token: CancellationToken) =>
    guarded(log, feature, fallback, () => {
      refuseAfterShutdown();
      const uri = uriOf(p);
      const a = uri === undefined ? undefined : store.current(uri);
      return a ? run(a, p, token) : fallback;
    })();
/**
 * As `on`, for a feature that may take long on a large document: the analysis runs in slices (see
 * DocumentStore.analyze), so a cancellation or an edit gets through, and the feature can pause too.
 */
const onSliced =
  <P, R>(feature: string, fallback: R, run: (a: Analyzed, p: P, token: CancellationToken) => Promise<R>) =>
  (p: P, token: CancellationToken) =>
    guarded(log, feature, fallback, async () => {
      refuseAfterShutdown();
      const uri = uriOf(p);
      const a = uri === undefined ? undefined : await store.analyze(uri, token);
      if (token.isCancellationRequested) throw cancelled();
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
  canRefreshCodeLens = !!params.capabilities.workspace?.codeLens?.refreshSupport;
  canRegisterConfiguration = !!params.capabilities.workspace?.didChangeConfiguration?.dynamicRegistration;
  const delay = (params.initializationOptions as { validationDelayMs?: unknown } | null | undefined)
    ?.validationDelayMs;
  if (typeof delay === 'number' && Number.isFinite(delay) && delay >= 0 && delay <= 600_000)
    validationDelayMs = delay;
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

// Document lifecycle and settings. An open fires a content change as well: that first version is
// validated at once, later ones after the debounce.
const justOpened = new Map<string, number>();
documents.onDidOpen((e) => justOpened.set(e.document.uri, e.document.version));
documents.onDidChangeContent((e) => {
  const opened = justOpened.get(e.document.uri) === e.document.version;
  justOpened.delete(e.document.uri);
  diagnostics.schedule(e.document.uri, opened ? 0 : undefined);
});
documents.onDidClose((e) => {
  justOpened.delete(e.document.uri);
  diagnostics.close(e.document.uri);
  store.evict(e.document.uri);
  settings.forget(e.document.uri);
});
connection.onDidChangeConfiguration((change) => {
  if (shutDown) return;
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
connection.onCodeAction(onSliced('codeActions', [], (a, p: CodeActionParams, token) => codeActions(a.report, p, token)));
connection.onCodeLens(on('codeLens', [], (a, p: CodeLensParams) => codeLenses(a.report, p.textDocument.uri)));
connection.onCompletion(on('completion', [], (a, p: CompletionParams) => completion(a.report, a.document, position(p))));
connection.onDocumentSymbol(on('documentSymbols', [], (a) => documentSymbols(a.report)));
connection.onDefinition(on('definition', null, (a, p: DefinitionParams) => definition(a.report, p.textDocument.uri, position(p))));
connection.onPrepareRename(on('prepareRename', null, (a, p: PrepareRenameParams) => prepareRename(a.report, position(p))));
connection.onRenameRequest(on('rename', null, (a, p: RenameParams) => rename(a.report, p.textDocument.uri, position(p), p.newName)));
connection.onRequest(PanelDataRequest.method, on('panelData', null, (a, p: PanelDataParams, token) => panelData(a.report, p, settings.known(p.uri), token)));
connection.onRequest(DesignSummaryRequest.method, on('designSummary', null, (a, p: DesignSummaryParams) => designSummary(a.report, p)));
connection.onRequest(CompensationEditRequest.method, on('compensationEdit', null, (a, p: CompensationEditParams) => compensationEdit(a.report, p)));
connection.onRequest(SolveDesignRequest.method, on('solveDesign', null, (a, p: SolveDesignParams) => solveDesignRequest(a.report, p, settings.known(p.uri))));
}

connection.onShutdown(() => {
  shutDown = true;
  diagnostics.dispose();
});
documents.listen(checkedDocumentSync(connection, log, () => shutDown));
connection.listen();

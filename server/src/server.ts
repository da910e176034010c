// The Ampnote language server: an adapter from LSP to the core's analyzeDocument. Every method the server
// answers is registered below, one line each. Runs over stdio (`--stdio`) or IPC (`--node-ipc`).
import {
  createConnection,
  DidChangeConfigurationNotification,
  ProposedFeatures,
  TextDocuments,
  TextDocumentSyncKind,
  type InitializeResult,
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
import { DocumentStore } from './documentStore';
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
const analysed = (params: unknown) => {
  const uri =
    (params as { textDocument?: { uri?: unknown }; uri?: unknown } | undefined)?.textDocument?.uri ??
    (params as { uri?: unknown })?.uri;
  return typeof uri === 'string' ? store.current(uri) : undefined;
};
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
connection.onDidChangeConfiguration(() => {
  settings.clear();
  store.invalidateAll();
  for (const doc of documents.all()) diagnostics.schedule(doc.uri, 0);
});

// Editor features: one line per LSP method.
connection.onHover(
  guarded(log, 'hover', null, (p) => {
    const a = analysed(p);
    return a ? hover(a.report, position(p)) : null;
  }),
);
connection.languages.inlayHint.on(
  guarded(log, 'inlayHints', [], (p) => {
    const a = analysed(p);
    return a ? inlayHints(a.report, a.document, p.range) : [];
  }),
);
connection.onCodeAction(
  guarded(log, 'codeActions', [], (p) => {
    const a = analysed(p);
    return a ? codeActions(a.report, p) : [];
  }),
);
connection.onCodeLens(
  guarded(log, 'codeLens', [], (p) => {
    const a = analysed(p);
    return a ? codeLenses(a.report, p.textDocument.uri) : [];
  }),
);
connection.onCompletion(
  guarded(log, 'completion', [], (p) => {
    const a = analysed(p);
    return a ? completion(a.report, a.document, position(p)) : [];
  }),
);
connection.onDocumentSymbol(
  guarded(log, 'documentSymbols', [], (p) => {
    const a = analysed(p);
    return a ? documentSymbols(a.report) : [];
  }),
);
connection.onDefinition(
  guarded(log, 'definition', null, (p) => {
    const a = analysed(p);
    return a ? definition(a.report, p.textDocument.uri, position(p)) : null;
  }),
);
connection.onPrepareRename(
  guarded(log, 'prepareRename', null, (p) => {
    const a = analysed(p);
    return a ? prepareRename(a.report, position(p)) : null;
  }),
);
connection.onRenameRequest(
  guarded(log, 'rename', null, (p) => {
    const a = analysed(p);
    return a ? rename(a.report, p.textDocument.uri, position(p), p.newName) : null;
  }),
);

// The extension's own requests.
connection.onRequest(
  PanelDataRequest.method,
  guarded(log, 'panelData', null, (p: PanelDataParams, token) => {
    const a = analysed(p);
    return a ? panelData(a.report, p, settings.known(p.uri), token) : null;
  }),
);
connection.onRequest(
  DesignSummaryRequest.method,
  guarded(log, 'designSummary', null, (p: DesignSummaryParams) => {
    const a = analysed(p);
    return a ? designSummary(a.report, p) : null;
  }),
);
connection.onRequest(
  CompensationEditRequest.method,
  guarded(log, 'compensationEdit', null, (p: CompensationEditParams) => {
    const a = analysed(p);
    return a ? compensationEdit(a.report, p) : null;
  }),
);

connection.onShutdown(() => diagnostics.dispose());
documents.listen(connection);
connection.listen();

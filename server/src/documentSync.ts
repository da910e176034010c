// Document notifications are checked before the document store sees them: a text that is not a string
// (or a change without one) would otherwise be stored and then fail every analysis of that document. Such
// a notification is refused once, with one log line, and the server's copy of the document stays as it
// was. After `shutdown` the protocol allows only `exit`, so document notifications are dropped as well.
import type {
  Connection,
  DidChangeTextDocumentParams,
  DidOpenTextDocumentParams,
} from 'vscode-languageserver';
import type { Logger } from './log';

type Handler<P> = (params: P) => void;

const isPosition = (p: unknown): boolean =>
  !!p &&
  typeof p === 'object' &&
  Number.isInteger((p as { line?: unknown }).line) &&
  Number.isInteger((p as { character?: unknown }).character) &&
  (p as { line: number }).line >= 0 &&
  (p as { character: number }).character >= 0;

const isRange = (r: unknown): boolean =>
  !!r &&
  typeof r === 'object' &&
  isPosition((r as { start?: unknown }).start) &&
  isPosition((r as { end?: unknown }).end);

/** Why an open notification cannot be taken, or undefined when it can. */
export function openProblem(params: unknown): string | undefined {
  const td = (params as { textDocument?: unknown } | null | undefined)?.textDocument as
    Record<string, unknown> | undefined;
  if (!td || typeof td !== 'object') return 'it names no document';
  if (typeof td['uri'] !== 'string') return 'its document has no URI';
  if (typeof td['text'] !== 'string') return 'its text is not a string';
  if (!Number.isInteger(td['version'])) return 'its version is not an integer';
  return undefined;
}

/** Why a change notification cannot be applied, or undefined when it can. */
export function changeProblem(params: unknown): string | undefined {
  const p = params as { textDocument?: Record<string, unknown>; contentChanges?: unknown } | null | undefined;
  if (!p?.textDocument || typeof p.textDocument['uri'] !== 'string') return 'it names no document';
  if (!Number.isInteger(p.textDocument['version'])) return 'its version is not an integer';
  if (!Array.isArray(p.contentChanges)) return 'it has no list of changes';
  for (const c of p.contentChanges as unknown[]) {
    if (!c || typeof c !== 'object' || typeof (c as { text?: unknown }).text !== 'string')
      return 'a change has no text';
    const range = (c as { range?: unknown }).range;
    if (range !== undefined && !isRange(range)) return 'a change has an invalid range';
  }
  return undefined;
}

const uriOf = (params: unknown): string => {
  const uri = (params as { textDocument?: { uri?: unknown } } | null | undefined)?.textDocument?.uri;
  return typeof uri === 'string' ? uri : '(no URI)';
};

/**
 * The connection as `TextDocuments.listen` should see it: open and change handlers that only receive
 * well-formed notifications, and nothing once `isShutDown()`.
 */
export function checkedDocumentSync(
  connection: Connection,
  log: Logger,
  isShutDown: () => boolean,
): Connection {
  const refused = new Set<string>();
  const refuse = (kind: string, params: unknown, why: string) => {
    const key = `${kind} ${uriOf(params)}`;
    if (refused.has(key)) return;
    refused.add(key);
    log.error(`[documents] ignored ${kind} of ${uriOf(params)}: ${why}`);
  };
  const open = (handler: Handler<DidOpenTextDocumentParams>) =>
    connection.onDidOpenTextDocument((params) => {
      if (isShutDown()) return;
      const why = openProblem(params);
      if (why) return refuse('didOpen', params, why);
      refused.delete(`didOpen ${params.textDocument.uri}`);
      handler(params);
    });
  const change = (handler: Handler<DidChangeTextDocumentParams>) =>
    connection.onDidChangeTextDocument((params) => {
      if (isShutDown()) return;
      const why = changeProblem(params);
      if (why) return refuse('didChange', params, why);
      handler(params);
    });
  return new Proxy(connection, {
    get(target, key, receiver) {
      if (key === 'onDidOpenTextDocument') return open;
      if (key === 'onDidChangeTextDocument') return change;
      return Reflect.get(target, key, receiver) as unknown;
    },
  });
}

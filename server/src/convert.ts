// Core findings and edits as LSP values.
import { pathToFileURL } from 'node:url';
import { join } from 'node:path';
import { DiagnosticSeverity, type Diagnostic, type Range, type TextEdit } from 'vscode-languageserver';
import type { Finding, TextEditSpec } from '../../shared/src/checks/types';
import type { SourceRange } from '../../shared/src/language/source';

export const toRange = (r: SourceRange): Range => ({
  start: { line: r.start.line, character: r.start.character },
  end: { line: r.end.line, character: r.end.character },
});

export const toEdit = (e: TextEditSpec): TextEdit => ({ range: toRange(e.range), newText: e.newText });

const SEVERITY = {
  error: DiagnosticSeverity.Error,
  warning: DiagnosticSeverity.Warning,
  info: DiagnosticSeverity.Information,
} as const;

/**
 * The checks' documentation ships with the extension (docs/checks.md beside dist/), so the link works
 * offline: a file URI with the code as its anchor.
 */
const hrefs = new Map<string, string>();
export function docsHref(code: string): string {
  let href = hrefs.get(code);
  if (!href) {
    const root = typeof __dirname === 'string' ? join(__dirname, '..') : process.cwd();
    href = `${pathToFileURL(join(root, 'docs', 'checks.md')).href}#${code}`;
    hrefs.set(code, href);
  }
  return href;
}

/** Which finding a diagnostic came from, so that code actions find its fixes again. */
export interface DiagnosticData {
  readonly index: number;
}

export function toDiagnostic(f: Finding, uri: string, index: number): Diagnostic {
  return {
    range: toRange(f.range),
    severity: SEVERITY[f.severity],
    code: f.code,
    codeDescription: { href: docsHref(f.code) },
    source: 'ampnote',
    message: f.message,
    relatedInformation: f.related.map((r) => ({
      location: { uri, range: toRange(r.range) },
      message: r.message,
    })),
    data: { index } satisfies DiagnosticData,
  };
}

const before = (a: { line: number; character: number }, b: { line: number; character: number }) =>
  a.line < b.line || (a.line === b.line && a.character <= b.character);

/** Whether two ranges overlap or touch. */
export const rangesMeet = (a: Range | SourceRange, b: Range | SourceRange): boolean =>
  before(a.start, b.end) && before(b.start, a.end);

export const sameRange = (a: Range | SourceRange, b: Range | SourceRange): boolean =>
  a.start.line === b.start.line &&
  a.start.character === b.start.character &&
  a.end.line === b.end.line &&
  a.end.character === b.end.character;

export const contains = (r: Range | SourceRange, p: { line: number; character: number }): boolean =>
  before(r.start, p) && before(p, r.end);

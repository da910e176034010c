// Quick fixes: each finding's solved, re-checked fixes as ordinary workspace edits.
import { CodeActionKind, type CodeAction, type CodeActionParams } from 'vscode-languageserver';
import type { DocumentReport } from '../../../shared/src/report';
import { rangesMeet, toDiagnostic, toEdit } from '../convert';

export function codeActions(report: DocumentReport, params: CodeActionParams): CodeAction[] {
  const uri = params.textDocument.uri;
  const only = params.context.only;
  if (
    only &&
    // A quick fix answers a request for `quickfix` or for a kind it belongs to (`` is every kind).
    !only.some(
      (k) => k === '' || k === CodeActionKind.QuickFix || CodeActionKind.QuickFix.startsWith(`${k}.`),
    )
  )
    return [];
  const actions: CodeAction[] = [];
  report.findings.forEach((finding, index) => {
    // The range test first: reading `fixes` solves them.
    if (!rangesMeet(finding.range, params.range) || !finding.fixes.length) return;
    const diagnostic =
      params.context.diagnostics.find(
        (d) =>
          d.code === finding.code &&
          d.range.start.line === finding.range.start.line &&
          d.range.start.character === finding.range.start.character,
      ) ?? toDiagnostic(finding, uri, index);
    for (const fix of finding.fixes) {
      actions.push({
        title: fix.title,
        kind: CodeActionKind.QuickFix,
        diagnostics: [diagnostic],
        ...(fix.preferred ? { isPreferred: true } : {}),
        edit: { changes: { [uri]: fix.edits.map(toEdit) } },
      });
    }
  });
  return actions;
}

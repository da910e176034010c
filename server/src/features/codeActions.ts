// Quick fixes: each finding's solved, re-checked fixes as ordinary workspace edits. Solving a fix runs the
// exact analysis again, so only findings the range touches are solved, a slice at a time with the event
// loop free in between: a cancellation (the user moved on) is seen and honoured between findings.
import {
  CodeActionKind,
  LSPErrorCodes,
  ResponseError,
  type CancellationToken,
  type CodeAction,
  type CodeActionParams,
  type Diagnostic,
} from 'vscode-languageserver';
import type { Finding } from '../../../shared/src/checks/types';
import type { DocumentReport } from '../../../shared/src/report';
import { rangesMeet, sameRange, toDiagnostic, toEdit } from '../convert';

/** Solve for at most this long before letting other messages (a cancellation) through. */
const SLICE_MS = 8;

const pause = () => new Promise<void>((resolve) => setImmediate(resolve));

export const cancelled = () => new ResponseError(LSPErrorCodes.RequestCancelled, 'the request was cancelled');

/** Whether a quick fix answers a request for these kinds (`` is every kind). */
function wantsQuickFix(only: readonly string[] | undefined): boolean {
  return (
    !only ||
    only.some((k) => k === '' || k === CodeActionKind.QuickFix || CodeActionKind.QuickFix.startsWith(`${k}.`))
  );
}

/**
 * The diagnostic the editor holds for `finding`: same code, same whole range and same message. Two findings
 * of one rule can start at the same place (one stage's gm wrapped by two Miller capacitors) and differ in
 * message and fixes, so a start position alone would hand one finding's fixes to the other.
 */
export function matchesFinding(d: Diagnostic, finding: Finding): boolean {
  return (
    !!d?.range?.start &&
    !!d.range.end &&
    d.code === finding.code &&
    d.message === finding.message &&
    sameRange(d.range, finding.range)
  );
}

export async function codeActions(
  report: DocumentReport,
  params: CodeActionParams,
  token: CancellationToken,
): Promise<CodeAction[]> {
  const uri = params.textDocument.uri;
  if (!wantsQuickFix(params.context.only)) return [];
  const given = Array.isArray(params.context.diagnostics) ? params.context.diagnostics : [];
  const actions: CodeAction[] = [];
  let sliceStart = Date.now();
  for (const [index, finding] of report.findings.entries()) {
    if (token.isCancellationRequested) throw cancelled();
    // The range test first: reading `fixes` solves them.
    if (!rangesMeet(finding.range, params.range)) continue;
    if (Date.now() - sliceStart >= SLICE_MS) {
      await pause();
      if (token.isCancellationRequested) throw cancelled();
      sliceStart = Date.now();
    }
    if (!finding.fixes.length) continue;
    const diagnostic = given.find((d) => matchesFinding(d, finding)) ?? toDiagnostic(finding, uri, index);
    for (const fix of finding.fixes) {
      actions.push({
        title: fix.title,
        kind: CodeActionKind.QuickFix,
        diagnostics: [diagnostic],
        ...(fix.preferred ? { isPreferred: true } : {}),
        // A fix that cannot be offered is shown disabled, with the solver's reason.
        ...(fix.disabled !== undefined
          ? { disabled: { reason: fix.disabled } }
          : { edit: { changes: { [uri]: fix.edits.map(toEdit) } } }),
      });
    }
  }
  return actions;
}

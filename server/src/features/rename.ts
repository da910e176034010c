// Rename a parameter, stage or node: its declaration and every use, in that design only.
import { ResponseError, ErrorCodes, type Range, type WorkspaceEdit } from 'vscode-languageserver';
import { BUILTIN_NODES, RESERVED_NAMES } from '../../../shared/src/language';
import type { SourcePosition } from '../../../shared/src/language/source';
import type { DocumentReport } from '../../../shared/src/report';
import { designAt } from '../../../shared/src/service';
import { toRange } from '../convert';
import { symbolAt } from './target';

const RENAMEABLE = new Set(['param', 'stage', 'node']);
const IDENTIFIER = /^[A-Za-z_][A-Za-z0-9_]*$/;

function renameable(report: DocumentReport, position: SourcePosition) {
  const design = designAt(report, position);
  const hit = design && symbolAt(design, position);
  if (!design || !hit || !RENAMEABLE.has(hit.symbol.kind)) return undefined;
  if ((BUILTIN_NODES as readonly string[]).includes(hit.symbol.name)) return undefined;
  return { design, hit };
}

export function prepareRename(
  report: DocumentReport,
  position: SourcePosition,
): { range: Range; placeholder: string } | null {
  const r = renameable(report, position);
  return r ? { range: toRange(r.hit.range), placeholder: r.hit.symbol.name } : null;
}

export function rename(
  report: DocumentReport,
  uri: string,
  position: SourcePosition,
  newName: unknown,
): WorkspaceEdit | null {
  // Checked before anything else: `IDENTIFIER.test(null)` would read the text "null".
  if (typeof newName !== 'string')
    throw new ResponseError(ErrorCodes.InvalidParams, 'the new name is missing or not a string');
  const r = renameable(report, position);
  if (!r) return null;
  if (!IDENTIFIER.test(newName))
    throw new ResponseError(ErrorCodes.InvalidParams, `\`${newName}\` is not a name`);
  // The same rule as a declaration: reserved words never, `out` not for a parameter (it is the output
  // node); field, element and requirement words (`cc`, `gm`, `pm`) are names like any other.
  if (RESERVED_NAMES.has(newName) || (r.hit.symbol.kind === 'param' && newName === 'out'))
    throw new ResponseError(
      ErrorCodes.InvalidParams,
      (BUILTIN_NODES as readonly string[]).includes(newName)
        ? `\`${newName}\` is a built-in node`
        : `\`${newName}\` is a word of the language`,
    );
  if (
    newName !== r.hit.symbol.name &&
    r.design.source.symbols.some((s) => s.name === newName && s.kind !== 'design')
  )
    throw new ResponseError(
      ErrorCodes.InvalidParams,
      `\`${newName}\` is already declared in design ${r.design.source.name}`,
    );
  const ranges = [r.hit.symbol.declaration, ...r.hit.symbol.references];
  return { changes: { [uri]: ranges.map((range) => ({ range: toRange(range), newText: newName })) } };
}

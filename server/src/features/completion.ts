// Completion from the language's own vocabulary: statement keywords at the start of a line, a statement's
// variants after its keyword (`require`, `element`), units after a number, else field names, flags, the
// names in scope, and the functions where a value can start.
import { CompletionItemKind, type CompletionItem } from 'vscode-languageserver';
import type { TextDocument } from 'vscode-languageserver-textdocument';
import {
  BUILTIN_NODES,
  FIELD_DIMENSIONS,
  FIELDS_BY_STATEMENT,
  FLAGS_BY_STATEMENT,
  FUNCTION_NAMES,
  FUNCTION_SIGNATURES,
  STATEMENT_KEYWORDS,
  UNIT_SPELLINGS,
  VARIANTS_BY_STATEMENT,
} from '../../../shared/src/language';
import { endsAfterNumber } from '../../../shared/src/language/lexer';
import type { SourcePosition } from '../../../shared/src/language/source';
import { DIM, lookupUnit, sameDimension } from '../../../shared/src/language/unitTable';
import type { DocumentReport } from '../../../shared/src/report';
import { designAt } from '../../../shared/src/service';

const keyword = (label: string, detail?: string): CompletionItem => ({
  label,
  kind: CompletionItemKind.Keyword,
  ...(detail ? { detail } : {}),
});

/**
 * True where a value can start: after `=`, a comparison, an operator, `(`, `settle`, `within` or `step`,
 * with perhaps a name being typed. A `,` starts one only inside a function's parentheses (in a corner it starts a target).
 */
function valueCanStart(before: string): boolean {
  const m = /(?:(\|\||[=(+\-*/^×·−∥,])|\b(settle|within|step))\s*(?:[A-Za-z_]\w*)?$/.exec(before);
  if (!m) return false;
  if (m[1] !== ',') return true;
  const open = before.split('(').length - before.split(')').length;
  return open > 0;
}

export function completion(
  report: DocumentReport,
  document: TextDocument,
  position: SourcePosition,
): CompletionItem[] {
  const before = document
    .getText({ start: { line: position.line, character: 0 }, end: position })
    .replace(/#.*$/, '');
  const words = before.trim().split(/\s+/).filter(Boolean);
  const typing = /\S$/.test(before) ? (words.pop() ?? '') : '';
  const design = designAt(report, position);

  // After a number (`1.1 `, `1.1p`), not after a name that ends in a digit (`gm1 `): units.
  if (endsAfterNumber(before)) {
    // Units of the field's own dimension first (`cc = 1.2 ` → farads), then the rest.
    const field = /\b([A-Za-z_]\w*)\s*=\s*[^=]*$/.exec(before)?.[1];
    const dim = field ? FIELD_DIMENSIONS[field] : undefined;
    return UNIT_SPELLINGS.map((u) => {
      const info = lookupUnit(u);
      const fits = !!dim && !!info && sameDimension(info.dim, DIM[dim]);
      return { label: u, kind: CompletionItemKind.Unit, sortText: `${fits ? 0 : 1}${u}` };
    });
  }
  if (!words.length) {
    const items = STATEMENT_KEYWORDS.map((k) => keyword(k));
    if (design) items.push(keyword('end', 'close the design'));
    else items.push(keyword('design', 'start a design'));
    return items;
  }
  const statement = words[0]!;
  const variants = VARIANTS_BY_STATEMENT[statement];
  if (variants && words.length === 1) return variants.words.map((k) => keyword(k, variants.detail));

  const items: CompletionItem[] = [];
  for (const f of FIELDS_BY_STATEMENT[statement] ?? []) {
    if (!new RegExp(`\\b${f}\\s*=`).test(before))
      items.push({ label: f, kind: CompletionItemKind.Field, insertText: `${f} = ` });
  }
  for (const f of FLAGS_BY_STATEMENT[statement] ?? []) items.push(keyword(f));
  if (design) {
    for (const s of design.source.symbols) {
      if (s.kind === 'design') continue;
      items.push({
        label: s.name,
        kind:
          s.kind === 'param'
            ? CompletionItemKind.Constant
            : s.kind === 'corner'
              ? CompletionItemKind.EnumMember
              : CompletionItemKind.Variable,
        detail: s.kind,
      });
    }
  }
  for (const n of BUILTIN_NODES)
    items.push({ label: n, kind: CompletionItemKind.Variable, detail: 'built-in node' });
  if (statement === 'require') items.push(keyword('ugf', 'the unity-gain frequency'), keyword('within'));
  if (valueCanStart(before))
    for (const f of FUNCTION_NAMES)
      items.push({ label: f, kind: CompletionItemKind.Function, detail: FUNCTION_SIGNATURES[f].usage });
  void typing;
  const seen = new Set<string>();
  return items.filter((i) => !seen.has(i.label) && seen.add(i.label));
}

// The outline: each design with its parameters, stages, nodes, corners and requirements.
import { SymbolKind, type DocumentSymbol } from 'vscode-languageserver';
import type { DocumentReport } from '../../../shared/src/report';
import type { SymbolInfo } from '../../../shared/src/language/model';
import { toRange } from '../convert';

/**
 * The editor rejects a whole outline when one symbol's name is empty, which a design has while its name is
 * still being typed: such a symbol is shown under a placeholder instead.
 */
const shownName = (name: string, kind: string) => (name.trim() ? name : `(unnamed ${kind})`);

const KIND: Record<SymbolInfo['kind'], SymbolKind> = {
  design: SymbolKind.Module,
  param: SymbolKind.Constant,
  stage: SymbolKind.Class,
  node: SymbolKind.Variable,
  corner: SymbolKind.EnumMember,
};

export function documentSymbols(report: DocumentReport): DocumentSymbol[] {
  return report.parsed.designs.map((design) => {
    const model = design.nominal;
    const statementRange = (s: SymbolInfo) => {
      if (!model) return s.declaration;
      if (s.kind === 'stage')
        return model.stages.find((x) => x.name === s.name)?.origin.range ?? s.declaration;
      if (s.kind === 'param')
        return model.params.find((x) => x.name === s.name)?.origin.range ?? s.declaration;
      if (s.kind === 'corner')
        return design.corners.find((x) => x.name === s.name)?.origin.range ?? s.declaration;
      return s.declaration;
    };
    const children: DocumentSymbol[] = design.symbols
      .filter((s) => s.kind !== 'design')
      .map((s) => {
        const range = statementRange(s);
        return {
          name: shownName(s.name, s.kind),
          detail: s.kind,
          kind: KIND[s.kind],
          range: toRange(range),
          selectionRange: toRange(s.declaration),
        };
      });
    for (const req of model?.requirements ?? []) {
      children.push({
        name: `require ${req.kind}`,
        kind: SymbolKind.Property,
        range: toRange(req.origin.range),
        selectionRange: toRange(req.origin.keywordRange),
      });
    }
    children.sort(
      (a, b) => a.range.start.line - b.range.start.line || a.range.start.character - b.range.start.character,
    );
    return {
      name: shownName(design.name, 'design'),
      detail: 'design',
      kind: SymbolKind.Module,
      range: toRange(design.range),
      selectionRange: toRange(design.nameRange),
      children,
    };
  });
}

// What the cursor is on: a declared name, or the statement (and field) whose text contains it.
import {
  feedbackNode,
  type BufferedCap,
  type DesignModel,
  type Element,
  type FeedbackNode,
  type Load,
  type Miller,
  type Param,
  type Requirement,
  type Stage,
  type SymbolInfo,
} from '../../../shared/src/language/model';
import type { SourcePosition, SourceRange } from '../../../shared/src/language/source';
import type { DesignReport } from '../../../shared/src/report';
import { contains } from '../convert';

export type Target =
  | { readonly kind: 'symbol'; readonly symbol: SymbolInfo; readonly range: SourceRange }
  | { readonly kind: 'stage'; readonly stage: Stage; readonly range: SourceRange; readonly field?: string }
  | {
      readonly kind: 'miller';
      readonly item: Miller;
      readonly index: number;
      readonly range: SourceRange;
      readonly field?: string;
    }
  | {
      readonly kind: 'buffered';
      readonly item: BufferedCap;
      readonly range: SourceRange;
      readonly field?: string;
    }
  | { readonly kind: 'load'; readonly item: Load; readonly range: SourceRange }
  | { readonly kind: 'element'; readonly item: Element; readonly range: SourceRange }
  | { readonly kind: 'requirement'; readonly item: Requirement; readonly range: SourceRange }
  | { readonly kind: 'param'; readonly item: Param; readonly range: SourceRange }
  | { readonly kind: 'feedback'; readonly item: FeedbackNode; readonly range: SourceRange }
  | { readonly kind: 'design'; readonly range: SourceRange };

/** The symbol (declaration or reference) at `position`. */
export function symbolAt(
  design: DesignReport,
  position: SourcePosition,
): { symbol: SymbolInfo; range: SourceRange } | undefined {
  for (const symbol of design.source.symbols) {
    for (const range of [symbol.declaration, ...symbol.references]) {
      if (contains(range, position)) return { symbol, range };
    }
  }
  return undefined;
}

function fieldAt(
  origin: { fields: Readonly<Record<string, { range: SourceRange }>> },
  p: SourcePosition,
): string | undefined {
  return Object.entries(origin.fields).find(([, f]) => contains(f.range, p))?.[0];
}

/** The statement of the nominal model at `position`. */
export function statementAt(model: DesignModel, p: SourcePosition): Target | undefined {
  for (const stage of model.stages) {
    if (contains(stage.origin.range, p)) {
      const field = fieldAt(stage.origin, p);
      return { kind: 'stage', stage, range: stage.origin.range, ...(field ? { field } : {}) };
    }
  }
  for (const [index, item] of model.millers.entries()) {
    if (contains(item.origin.range, p)) {
      const field = fieldAt(item.origin, p);
      return { kind: 'miller', item, index, range: item.origin.range, ...(field ? { field } : {}) };
    }
  }
  for (const item of model.buffered) {
    if (contains(item.origin.range, p)) {
      const field = fieldAt(item.origin, p);
      return { kind: 'buffered', item, range: item.origin.range, ...(field ? { field } : {}) };
    }
  }
  for (const item of model.loads)
    if (contains(item.origin.range, p)) return { kind: 'load', item, range: item.origin.range };
  for (const item of model.elements)
    if (contains(item.origin.range, p)) return { kind: 'element', item, range: item.origin.range };
  for (const item of model.requirements)
    if (contains(item.origin.range, p)) return { kind: 'requirement', item, range: item.origin.range };
  for (const item of model.params)
    if (contains(item.origin.range, p)) return { kind: 'param', item, range: item.origin.range };
  const at = feedbackNode(model);
  if (at && contains(at.origin.range, p)) return { kind: 'feedback', item: at, range: at.origin.range };
  return undefined;
}

/** A name under the cursor wins over the statement around it, except a stage's own name (its statement says more). */
export function targetAt(design: DesignReport, position: SourcePosition): Target | undefined {
  const model = design.source.nominal;
  const sym = symbolAt(design, position);
  if (sym && model) {
    if (sym.symbol.kind === 'stage' || sym.symbol.kind === 'node') {
      const stage = model.stages.find((s) => s.name === sym.symbol.name);
      if (stage) return { kind: 'stage', stage, range: sym.range };
    }
    if (sym.symbol.kind === 'param') {
      const item = model.params.find((p) => p.name === sym.symbol.name);
      if (item) return { kind: 'param', item, range: sym.range };
    }
  }
  if (sym?.symbol.kind === 'design') return { kind: 'design', range: sym.range };
  if (sym) return { kind: 'symbol', symbol: sym.symbol, range: sym.range };
  const inModel = model ? statementAt(model, position) : undefined;
  if (inModel) return inModel;
  // A corner line outside its name: the corner itself.
  const corner = design.source.corners.find((c) => contains(c.origin.range, position));
  const symbol = corner && design.source.symbols.find((s) => s.kind === 'corner' && s.name === corner.name);
  return symbol && corner ? { kind: 'symbol', symbol, range: corner.origin.range } : undefined;
}

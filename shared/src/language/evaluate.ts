// Design syntax → typed design models (nominal and one per corner) and the names the design declares.
import { quote, type DiagnosticSink } from './diagnostics';
import { checkConnections } from './connections';
import { DesignScope } from './designScope';
import { tokenRange } from './lexer';
import type { CornerSource, DesignModel, FieldOrigin, Origin, SymbolInfo } from './model';
import { ModelBuilder } from './modelBuilder';
import { collectOverrides, NO_OVERRIDES } from './overrides';
import { collectSymbols } from './symbols';
import type { DesignSyntax } from './syntax';

export interface DesignResult {
  readonly nominal?: DesignModel;
  readonly corners: CornerSource[];
  readonly symbols: SymbolInfo[];
}

export function evaluateDesign(design: DesignSyntax, sink: DiagnosticSink): DesignResult {
  const scope = new DesignScope(design, sink);
  checkConnections(scope);
  const builder = new ModelBuilder(scope, NO_OVERRIDES);
  const nominal = builder.build();
  const corners: CornerSource[] = [];
  for (const s of design.statements) {
    if (s.kind !== 'corner' || !s.name || scope.corners.get(s.name.text) !== s) continue;
    const fields: Record<string, FieldOrigin> = {};
    for (const o of s.overrides) fields[o.targetText] = { range: o.expr.range, text: o.text };
    const origin: Origin = {
      range: s.range,
      keywordRange: tokenRange(s.keyword),
      insertAt: s.insertAt,
      fields,
    };
    const { overrides, ok } = collectOverrides(scope, s);
    let model: DesignModel | undefined;
    if (!s.broken && !s.overrides.length)
      sink.warning('syntax', `Corner ${quote(s.name.text)} overrides nothing.`, tokenRange(s.name));
    {
      // Evaluated even when some override is wrong, so that every mistake in the corner is reported.
      const cornerBuilder = new ModelBuilder(scope, overrides, builder, s);
      const m = cornerBuilder.build();
      if (m && ok && !s.broken && !cornerBuilder.incomplete) model = { ...m, corner: s.name.text };
    }
    corners.push({ name: s.name.text, origin, ...(model ? { model } : {}) });
  }
  return { ...(nominal ? { nominal } : {}), corners, symbols: collectSymbols(scope) };
}

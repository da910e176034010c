// The names a design declares, with every place they are used: from the text alone, so that go to
// definition and rename work even in a design with errors.
import { nodeTokens, type DesignScope } from './designScope';
import { forEachRef } from './expression';
import { tokenRange } from './lexer';
import type { SymbolInfo } from './model';
import type { SourceRange } from './source';

/** Every declared name with its declaration and references, found from the text alone. */
export function collectSymbols(scope: DesignScope): SymbolInfo[] {
  const symbols = new Map<string, { info: SymbolInfo; refs: SourceRange[] }>();
  const design = scope.design;
  const result: SymbolInfo[] = [];
  if (design.nameToken)
    result.push({
      name: design.name,
      kind: 'design',
      declaration: tokenRange(design.nameToken),
      references: [],
    });
  for (const [name, d] of scope.decls) {
    const refs: SourceRange[] = [];
    const info: SymbolInfo = { name, kind: d.kind, declaration: tokenRange(d.token), references: refs };
    symbols.set(name, { info, refs });
    result.push(info);
  }
  const ref = (name: string, range: SourceRange): void => {
    symbols.get(name)?.refs.push(range);
  };
  for (const s of design.statements) {
    for (const f of s.fields) forEachRef(f.expr, ref);
    for (const t of nodeTokens(s)) ref(t.text, tokenRange(t));
    if (s.kind === 'corner') {
      for (const o of s.overrides) {
        ref(o.target.text, tokenRange(o.target));
        forEachRef(o.expr, ref);
      }
    }
    // The swept parameter, named by the sweep: rename and go to definition reach it.
    if (s.kind === 'sweep' && s.name) ref(s.name.text, tokenRange(s.name));
  }
  for (const [name, c] of scope.corners)
    result.push({ name, kind: 'corner', declaration: tokenRange(c.name!), references: [] });
  return result;
}

// `supply NODE[, NODE …]`: declares nodes held by ideal small-signal voltage sources. Every analysis holds
// them at AC ground, except the supply-rejection one, which drives each in turn (docs/analysis.md).
import { tokenRange, type Token } from '../lexer';
import { node } from '../nodeName';
import { NOTHING } from '../modelParts';
import type { StatementCommon } from '../syntax';
import type { StatementDescriptor } from './statementKind';

export type SupplyStatement = StatementCommon & { readonly kind: 'supply'; readonly names: readonly Token[] };

export const supplyKind: StatementDescriptor<SupplyStatement> = {
  keyword: 'supply',
  fields: [],
  flags: [],
  connectors: [],
  overriddenByKeyword: false,
  parse(p, parts) {
    const names: Token[] = [];
    parts.names = names;
    p.nameList('a supply node name', names);
  },
  nodes: () => [],
  declares: (s) => s.names.map((token) => ({ kind: 'node', token, statement: s })),
  build(s, ctx) {
    const supplies = [];
    for (const t of s.names) {
      // A name declared twice belongs to its first declaration, which reports the duplicate.
      if (ctx.scope.decls.get(t.text)?.statement !== s) continue;
      // (`in` cannot be declared at all: the design's scope reports it.)
      if (t.text === ctx.output()) {
        ctx.sink.error('reference', 'The output cannot be a supply.', tokenRange(t));
        continue;
      }
      supplies.push({ node: node(t.text), origin: { ...ctx.origin(s, {}), keywordRange: tokenRange(t) } });
    }
    return supplies.length > 0 ? { supplies } : NOTHING;
  },
};

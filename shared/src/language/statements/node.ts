// `node NAME, NAME …`: extra nodes for elements. Declares names only; elements attach to them.
import type { Token } from '../lexer';
import { NOTHING } from '../modelParts';
import type { StatementCommon } from '../syntax';
import type { StatementDescriptor } from './statementKind';

export type NodeStatement = StatementCommon & { readonly kind: 'node'; readonly names: readonly Token[] };

export const nodeKind: StatementDescriptor<NodeStatement> = {
  keyword: 'node',
  fields: [],
  flags: [],
  connectors: [],
  overriddenByKeyword: false,
  parse(p, parts) {
    const names: Token[] = [];
    parts.names = names;
    p.nameList('a node name', names);
  },
  nodes: () => [],
  declares: (s) => s.names.map((token) => ({ kind: 'node', token, statement: s })),
  build: () => NOTHING,
};

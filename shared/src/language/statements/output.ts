// `output NODE`: the node whose voltage is the design's output. The model builder resolves it before any
// statement is built, since a load without `at` sits there.
import type { Token } from '../lexer';
import { NOTHING } from '../modelParts';
import type { StatementCommon } from '../syntax';
import { sensed, type StatementDescriptor } from './statementKind';

export type OutputStatement = StatementCommon & { readonly kind: 'output'; readonly node?: Token };

export const outputKind: StatementDescriptor<OutputStatement> = {
  keyword: 'output',
  fields: [],
  flags: [],
  connectors: [],
  overriddenByKeyword: false,
  parse(p, parts) {
    parts.node = p.name('the output node');
    p.finish();
  },
  nodes: (s) => sensed(s.node),
  declares: () => [],
  build: () => NOTHING,
};

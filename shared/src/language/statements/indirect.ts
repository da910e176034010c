// `indirect NODE -> NODE cc = … gm = … [cap = …]`: a capacitor from the first node into the input of a
// current buffer whose output current feeds the second node.
import { si, type Farads } from '../../units';
import type { Token } from '../lexer';
import { NOTHING } from '../modelParts';
import type { StatementCommon } from '../syntax';
import { distinctEnds, resolveCapacitorEnds } from './capacitorEnds';
import { attached, type StatementDescriptor } from './statementKind';

export type IndirectStatement = StatementCommon & {
  readonly kind: 'indirect';
  readonly from?: Token;
  readonly to?: Token;
};

export const indirectKind: StatementDescriptor<IndirectStatement> = {
  keyword: 'indirect',
  fields: [
    { name: 'cc', unit: 'F', role: 'cap', required: true },
    { name: 'gm', unit: 'S', role: 'gm-buffer', required: true },
    { name: 'cap', unit: 'F', role: 'cap' },
  ],
  flags: [],
  connectors: [],
  overriddenByKeyword: true,
  parse(p, parts) {
    Object.assign(parts, p.nodePair('the capacitor'));
    p.fieldList();
  },
  nodes: (s) => [...attached(s.from), ...attached(s.to)],
  declares: () => [],
  build(s, ctx) {
    const ends = resolveCapacitorEnds(s, ctx);
    const f = ctx.fields(s, indirectKind.fields);
    const nodes = f && distinctEnds(s, ends, ctx);
    if (!f || !nodes) return NOTHING;
    return {
      buffered: [
        {
          ...nodes,
          cc: si(f.values.cc!),
          gm: si(f.values.gm!),
          ...(f.values.cap !== undefined ? { cap: si<Farads>(f.values.cap) } : {}),
          origin: ctx.origin(s, f.origins),
        },
      ],
    };
  },
};

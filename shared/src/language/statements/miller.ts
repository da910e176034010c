// `miller NODE -> NODE cc = … [rz = …]`: a compensation capacitor between two nodes, with an optional series
// nulling resistor.
import { si, type Ohms } from '../../units';
import type { Token } from '../lexer';
import { NOTHING } from '../modelParts';
import type { StatementCommon } from '../syntax';
import { distinctEnds, resolveCapacitorEnds } from './capacitorEnds';
import { attached, type StatementDescriptor } from './statementKind';

export type MillerStatement = StatementCommon & {
  readonly kind: 'miller';
  readonly from?: Token;
  readonly to?: Token;
};

export const millerKind: StatementDescriptor<MillerStatement> = {
  keyword: 'miller',
  fields: [
    { name: 'cc', unit: 'F', role: 'cap', required: true },
    { name: 'rz', unit: 'ohm', role: 'rz' },
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
    const f = ctx.fields(s, millerKind.fields);
    const nodes = f && distinctEnds(s, ends, ctx);
    if (!f || !nodes) return NOTHING;
    return {
      millers: [
        {
          ...nodes,
          cc: si(f.values.cc!),
          ...(f.values.rz !== undefined ? { rz: si<Ohms>(f.values.rz) } : {}),
          origin: ctx.origin(s, f.origins),
        },
      ],
    };
  },
};

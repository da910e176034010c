// `load [at NODE] [cap = …] [res = …]`: a capacitance and/or resistance to ground, at the output by default.
import { si, type Farads, type Ohms } from '../../units';
import { tokenRange, type Token } from '../lexer';
import { NOTHING } from '../modelParts';
import type { StatementCommon } from '../syntax';
import { attached, type StatementDescriptor } from './statementKind';

export type LoadStatement = StatementCommon & { readonly kind: 'load'; readonly at?: Token };

export const loadKind: StatementDescriptor<LoadStatement> = {
  keyword: 'load',
  fields: [
    { name: 'cap', unit: 'F', role: 'cap-board' },
    { name: 'res', unit: 'ohm', role: 'res' },
  ],
  flags: [],
  connectors: ['at'],
  overriddenByKeyword: true,
  parse(p, parts) {
    p.fieldList((t) => {
      if (t.text !== 'at') return false;
      if (parts.at) p.fail('`at` is given twice.', tokenRange(t));
      p.c.next();
      parts.at = p.name('the node the load sits at');
      return true;
    });
  },
  nodes: (s) => attached(s.at),
  declares: () => [],
  build(s, ctx) {
    const at = s.at ? ctx.resolveNodeName(s.at, 'A load') : ctx.output();
    const f = ctx.fields(s, loadKind.fields);
    if (!f || !at) return NOTHING;
    if (f.values.cap === undefined && f.values.res === undefined && !s.fields.length) {
      ctx.sink.error('syntax', '`load` needs `cap = …` or `res = …`.', tokenRange(s.keyword));
      return NOTHING;
    }
    return {
      loads: [
        {
          node: at,
          ...(f.values.cap !== undefined ? { cap: si<Farads>(f.values.cap) } : {}),
          ...(f.values.res !== undefined ? { res: si<Ohms>(f.values.res) } : {}),
          origin: ctx.origin(s, f.origins),
        },
      ],
    };
  },
};

// `feedforward NODE -> NODE gm = … [inverting]`: gm times the first node's voltage, injected into the second.
import { si } from '../../units';
import type { Token } from '../lexer';
import { NOTHING } from '../modelParts';
import type { PolaritySyntax, StatementCommon } from '../syntax';
import { attached, sensed, type StatementDescriptor } from './statementKind';

export type FeedforwardStatement = StatementCommon & {
  readonly kind: 'feedforward';
  readonly from?: Token;
  readonly to?: Token;
  readonly polarity?: PolaritySyntax;
};

export const feedforwardKind: StatementDescriptor<FeedforwardStatement> = {
  keyword: 'feedforward',
  fields: [{ name: 'gm', unit: 'S', role: 'gm', required: true }],
  flags: ['inverting', 'noninverting'],
  connectors: [],
  overriddenByKeyword: true,
  parse(p, parts) {
    Object.assign(parts, p.nodePair('the path'));
    p.fieldList();
  },
  nodes: (s) => [...sensed(s.from), ...attached(s.to)],
  declares: () => [],
  build(s, ctx) {
    const control = s.from && ctx.resolveNode(s.from);
    const output = s.to && ctx.resolveNode(s.to);
    const f = ctx.fields(s, feedforwardKind.fields);
    if (!f || !control || !output) return NOTHING;
    return {
      elements: [
        {
          kind: 'gm',
          control,
          output,
          value: si(f.values.gm!),
          polarity: s.polarity?.value ?? 'noninverting',
          origin: ctx.origin(s, f.origins),
        },
      ],
    };
  },
};

// `feedback beta = …`: the feedback factor for loop-gain margins. The first `feedback` of a design is used.
import { si } from '../../units';
import { tokenRange } from '../lexer';
import { NOTHING } from '../modelParts';
import type { StatementCommon } from '../syntax';
import type { StatementDescriptor } from './statementKind';

export type FeedbackStatement = StatementCommon & { readonly kind: 'feedback' };

export const feedbackKind: StatementDescriptor<FeedbackStatement> = {
  keyword: 'feedback',
  fields: [{ name: 'beta', unit: 'one', role: 'beta', required: true }],
  flags: [],
  connectors: [],
  overriddenByKeyword: true,
  parse(p) {
    p.fieldList();
  },
  nodes: () => [],
  declares: () => [],
  build(s, ctx) {
    const first = ctx.scope.firstLive('feedback');
    if (first && first !== s) {
      ctx.sink.error('syntax', '`feedback` is given twice; the first one is used.', tokenRange(s.keyword), [
        { range: tokenRange(first.keyword), message: 'first `feedback`' },
      ]);
      return NOTHING;
    }
    const f = ctx.fields(s, feedbackKind.fields);
    if (!f) return NOTHING;
    return { feedback: [{ beta: si(f.values.beta!), origin: ctx.origin(s, f.origins) }] };
  },
};

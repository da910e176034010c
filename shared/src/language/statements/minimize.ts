// `minimize EXPR`: what the solve makes small (one per design), an expression of the design's parameters
// evaluated in each model. Without it, the solve minimises the current the design draws (see
// solve/objective.ts).
import { tokenRange } from '../lexer';
import { NOTHING } from '../modelParts';
import type { StatementCommon } from '../syntax';
import type { StatementDescriptor } from './statementKind';

export type MinimizeStatement = StatementCommon & { readonly kind: 'minimize' };

export const minimizeKind: StatementDescriptor<MinimizeStatement> = {
  keyword: 'minimize',
  fields: [],
  flags: [],
  connectors: [],
  overriddenByKeyword: false,
  parse(p) {
    const keyword = p.c.last()!;
    p.addField(
      'value',
      keyword,
      p.expr(
        () => 'Missing what to minimize (e.g. `minimize id1 + id2`).',
        () => tokenRange(keyword),
      ),
    );
    p.finish();
  },
  nodes: () => [],
  declares: () => [],
  build(s, ctx) {
    const first = ctx.scope.firstLive('minimize');
    if (first && first !== s) {
      ctx.sink.error('syntax', '`minimize` is given twice; the first one is used.', tokenRange(s.keyword), [
        { range: tokenRange(first.keyword), message: 'first `minimize`' },
      ]);
      return NOTHING;
    }
    const q = ctx.quantity(s, 'value');
    if (!q) return NOTHING;
    return {
      objective: [{ value: q.value, text: q.origin.text, origin: ctx.origin(s, { value: q.origin }) }],
    };
  },
};

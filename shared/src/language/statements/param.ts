// `param NAME = expr [free LOW .. HIGH]`: a named value; with `free`, one the solve may move within the
// bounds. Parameters are evaluated on demand, in dependency order, by the model builder; the statement
// itself adds nothing to a model's lists.
import { quote } from '../diagnostics';
import { tokenRange, type Token } from '../lexer';
import { NOTHING } from '../modelParts';
import type { StatementCommon } from '../syntax';
import type { StatementDescriptor } from './statementKind';

export type ParamStatement = StatementCommon & {
  readonly kind: 'param';
  readonly name?: Token;
  /** The `free` word, when the parameter is free (its bounds are the fields `low` and `high`). */
  readonly free?: Token;
};

export const paramKind: StatementDescriptor<ParamStatement> = {
  keyword: 'param',
  fields: [],
  flags: [],
  connectors: ['free'],
  overriddenByKeyword: false,
  parse(p, parts) {
    const name = (parts.name = p.name('a parameter name'));
    const eq = p.op('=', () => `Missing \`=\` after the parameter name ${quote(name.text)}.`);
    const value = p.expr(
      () => `Missing value for ${quote(name.text)}.`,
      () => tokenRange(eq),
    );
    p.addField('value', eq, value);
    const free = p.c.peek();
    if (free?.kind === 'ident' && free.text === 'free') {
      p.c.next();
      parts.free = free;
      const low = p.expr(
        () => 'Missing the lower bound after `free` (e.g. `free 0.2 pF .. 5 pF`).',
        () => tokenRange(free),
      );
      p.addField('low', free, low);
      const dots = p.op('..', () => 'Expected `..` between the bounds (e.g. `free 0.2 pF .. 5 pF`).');
      p.addField(
        'high',
        dots,
        p.expr(
          () => 'Missing the upper bound after `..`.',
          () => tokenRange(dots),
        ),
      );
    }
    p.finish();
  },
  nodes: () => [],
  declares: (s) => (s.name ? [{ kind: 'param', token: s.name, statement: s }] : []),
  build: () => NOTHING,
};

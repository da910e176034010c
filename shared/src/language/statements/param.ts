// `param NAME = expr`: a named value. Parameters are evaluated on demand, in dependency order, by the model
// builder; the statement itself adds nothing to a model's lists.
import { quote } from '../diagnostics';
import { tokenRange, type Token } from '../lexer';
import { NOTHING } from '../modelParts';
import type { StatementCommon } from '../syntax';
import type { StatementDescriptor } from './statementKind';

export type ParamStatement = StatementCommon & { readonly kind: 'param'; readonly name?: Token };

export const paramKind: StatementDescriptor<ParamStatement> = {
  keyword: 'param',
  fields: [],
  flags: [],
  connectors: [],
  overriddenByKeyword: false,
  parse(p, parts) {
    const name = (parts.name = p.name('a parameter name'));
    const eq = p.op('=', () => `Missing \`=\` after the parameter name ${quote(name.text)}.`);
    p.addField(
      'value',
      eq,
      p.expr(
        () => `Missing value for ${quote(name.text)}.`,
        () => tokenRange(eq),
      ),
    );
    p.finish();
  },
  nodes: () => [],
  declares: (s) => (s.name ? [{ kind: 'param', token: s.name, statement: s }] : []),
  build: () => NOTHING,
};

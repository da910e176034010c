// `corner NAME target = value, …`: a named variant of the design. Corners are evaluated into models of
// their own (see evaluate.ts); the statement adds nothing to the nominal model.
import { quote } from '../diagnostics';
import { spanRange, tokenRange, type Token } from '../lexer';
import { NOTHING } from '../modelParts';
import type { SourceRange } from '../source';
import type { StatementParser } from '../statementParser';
import type { OverrideSyntax, StatementCommon } from '../syntax';
import type { StatementDescriptor } from './statementKind';

export type CornerStatement = StatementCommon & {
  readonly kind: 'corner';
  readonly name?: Token;
  readonly overrides: readonly OverrideSyntax[];
};

export const cornerKind: StatementDescriptor<CornerStatement> = {
  keyword: 'corner',
  fields: [],
  flags: [],
  connectors: [],
  overriddenByKeyword: false,
  parse(p, parts) {
    const overrides: OverrideSyntax[] = [];
    parts.overrides = overrides;
    parts.name = p.name('a corner name');
    parseOverrides(p, overrides);
  },
  nodes: () => [],
  declares: (s) => (s.name ? [{ kind: 'corner', token: s.name, statement: s }] : []),
  build: () => NOTHING,
};

function parseOverrides(p: StatementParser, out: OverrideSyntax[]): void {
  const seen = new Map<string, SourceRange>();
  while (!p.c.atEnd()) {
    const target = p.name('a parameter or `name.field` to override');
    let field: Token | undefined;
    if (p.c.isOp('.')) {
      p.c.next();
      field = p.name(() => `a field name after ${quote(`${target.text}.`)}`);
    }
    const targetText = field ? `${target.text}.${field.text}` : target.text;
    const eq = p.op('=', () => `Missing \`=\` after ${quote(targetText)}.`);
    const expr = p.expr(
      () => `Missing value for ${quote(targetText)}.`,
      () => spanRange(target, eq),
    );
    const targetRange = spanRange(target, field ?? target);
    const first = seen.get(targetText);
    if (first) {
      p.sink.error('syntax', `${quote(targetText)} is overridden twice in this corner.`, targetRange, [
        { range: first, message: `first ${quote(targetText)}` },
      ]);
    } else {
      seen.set(targetText, targetRange);
      out.push({ target, field, targetText, targetRange, expr, text: p.exprText(expr) });
    }
    if (p.c.isOp(',')) {
      const comma = p.c.next()!;
      if (p.c.atEnd()) p.fail('Expected another override after `,`.', tokenRange(comma));
    }
  }
}

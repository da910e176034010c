// `feedback beta = …`: the feedback factor for loop-gain margins, or `feedback at NODE`: the loop is closed
// by the design's own elements and NODE is the node the amplifier senses. The first `feedback` is used.
import { si } from '../../units';
import { tokenRange, type Token } from '../lexer';
import { NOTHING } from '../modelParts';
import { quote } from '../diagnostics';
import type { DesignScope } from '../designScope';
import type { StatementCommon } from '../syntax';
import { sensed, type StatementDescriptor } from './statementKind';

export type FeedbackStatement = StatementCommon & {
  readonly kind: 'feedback';
  /** `at NODE`: the feedback node. */
  readonly at?: Token;
};

export const feedbackKind: StatementDescriptor<FeedbackStatement> = {
  keyword: 'feedback',
  fields: [{ name: 'beta', unit: 'one', role: 'beta', required: true }],
  flags: [],
  connectors: ['at'],
  overriddenByKeyword: true,
  parse(p, parts) {
    const t = p.c.peek();
    if (t?.kind === 'ident' && t.text === 'at') {
      p.c.next();
      parts.at = p.name('the feedback node the amplifier senses');
      const rest = p.c.peek();
      if (rest?.kind === 'ident' && rest.text === 'beta')
        p.fail(
          '`feedback at` closes the loop through the circuit itself; a `beta` cannot be given with it.',
          tokenRange(rest),
        );
      p.finish();
      return;
    }
    p.fieldList((w) => {
      if (w.text === 'at')
        p.fail('`feedback at NODE` and `feedback beta = …` are exclusive: write one of them.', tokenRange(w));
      return false;
    });
  },
  nodes: (s) => sensed(s.at),
  declares: () => [],
  build(s, ctx) {
    const first = ctx.scope.firstLive('feedback');
    if (first && first !== s) {
      ctx.sink.error('syntax', '`feedback` is given twice; the first one is used.', tokenRange(s.keyword), [
        { range: tokenRange(first.keyword), message: 'first `feedback`' },
      ]);
      return NOTHING;
    }
    if (s.at) return buildAt(s, s.at, ctx);
    const f = ctx.fields(s, feedbackKind.fields);
    if (!f) return NOTHING;
    return { feedback: [{ kind: 'factor', beta: si(f.values.beta!), origin: ctx.origin(s, f.origins) }] };
  },
};

function buildAt(
  s: FeedbackStatement,
  at: Token,
  ctx: Parameters<typeof feedbackKind.build>[1],
): ReturnType<typeof feedbackKind.build> {
  // A corner can only reach `beta` through `feedback.beta`: a loop closed by the circuit has none.
  const override = ctx.writtenExpr(s, 'beta');
  if (override)
    ctx.sink.error(
      'reference',
      '`feedback at` closes the loop through the circuit and has no `beta` to override: override the values of the elements that set the loop instead.',
      override.range,
    );
  const node = ctx.resolveNodeName(at, 'The feedback node');
  if (!node) return NOTHING;
  if (node === 'in') {
    ctx.sink.error(
      'reference',
      'The feedback node cannot be the driven input `in`: name the node that the feedback network returns to.',
      tokenRange(at),
    );
    return NOTHING;
  }
  if (!sensedByTransconductor(ctx.scope, node)) {
    ctx.sink.error(
      'reference',
      `Nothing senses ${quote(node)}: the loop is broken where a transconductor senses the feedback node, so name a node that a stage (\`from\`), an \`element gm\` or a \`feedforward\` senses.`,
      tokenRange(at),
    );
    return NOTHING;
  }
  return { feedback: [{ kind: 'node', node, origin: ctx.origin(s, {}) }] };
}

/** Whether a transconductor input senses `node`: a stage (its `from`, or the stage before it), an `element gm` or a `feedforward`. */
function sensedByTransconductor(scope: DesignScope, node: string): boolean {
  return scope.design.statements.some((t) => {
    switch (t.kind) {
      case 'stage':
        return t.from ? t.from.text === node || t.fromN?.text === node : scope.defaultInput(t) === node;
      case 'element':
        return t.element === 'gm' && (t.a?.text === node || t.aN?.text === node);
      case 'feedforward':
        return t.from?.text === node;
      default:
        return false;
    }
  });
}

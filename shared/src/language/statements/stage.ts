// `stage NAME [from NODE[, NODE]] gm = … rout = … [cap = …] [bias = …] [inverting]`: a transconductance from its input
// into its own output node, which has `rout` and `cap` to ground. `from P, N` senses v(P) − v(N).
import { si, type Amperes } from '../../units';
import { tokenRange, type Token } from '../lexer';
import type { NodeRef } from '../model';
import { NOTHING } from '../modelParts';
import { sameRef } from '../nodeRefs';
import { node } from '../nodeName';
import type { PolaritySyntax, StatementCommon } from '../syntax';
import { sensed, type StatementDescriptor } from './statementKind';

export type StageStatement = StatementCommon & {
  readonly kind: 'stage';
  readonly name?: Token;
  readonly from?: Token;
  /** `from P, N`: the node sensed on the negative side. */
  readonly fromN?: Token;
  readonly polarity?: PolaritySyntax;
};

export const stageKind: StatementDescriptor<StageStatement> = {
  keyword: 'stage',
  fields: [
    { name: 'gm', unit: 'S', role: 'gm-stage', required: true },
    { name: 'rout', unit: 'ohm', role: 'rout', required: true },
    { name: 'cap', unit: 'F', role: 'cap' },
    { name: 'bias', unit: 'A', role: 'bias' },
  ],
  flags: ['inverting', 'noninverting'],
  connectors: ['from'],
  overriddenByKeyword: false,
  parse(p, parts) {
    parts.name = p.name('a stage name');
    p.fieldList((t) => {
      if (t.text !== 'from') return false;
      if (parts.from) p.fail('`from` is given twice.', tokenRange(t));
      p.c.next();
      parts.from = p.name('the node that drives this stage');
      if (p.c.isOp(',')) {
        p.c.next();
        parts.fromN = p.name('the node sensed on the negative side (`from P, N` senses P − N)');
      }
      return true;
    });
  },
  nodes: (s) => [...sensed(s.from), ...sensed(s.fromN)],
  declares: (s) => (s.name ? [{ kind: 'stage', token: s.name, statement: s }] : []),
  build(s, ctx) {
    // A second stage of the same name declares nothing: the first one owns the node.
    if (!s.name || ctx.scope.decls.get(s.name.text)?.statement !== s) return NOTHING;
    const input: NodeRef | undefined = s.from
      ? ctx.resolveNode(s.from)
      : { kind: 'node', name: ctx.scope.defaultInput(s) };
    const inputN = s.fromN ? ctx.resolveNode(s.fromN) : undefined;
    const f = ctx.fields(s, stageKind.fields);
    if (!f || !input || (s.fromN && !inputN)) return NOTHING;
    if (inputN && sameRef(input, inputN)) {
      ctx.sink.error('reference', 'A stage cannot sense the same node on both sides.', tokenRange(s.fromN!));
      return NOTHING;
    }
    return {
      stages: [
        {
          name: node(s.name.text),
          input,
          ...(inputN && inputN.kind !== 'ground' ? { inputN } : {}),
          gm: si(f.values.gm!),
          rout: si(f.values.rout!),
          cap: si(f.values.cap ?? 0),
          polarity: s.polarity?.value ?? 'noninverting',
          ...(f.values.bias !== undefined ? { bias: si<Amperes>(f.values.bias) } : {}),
          origin: ctx.origin(s, f.origins),
        },
      ],
    };
  },
};

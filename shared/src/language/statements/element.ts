// `element res|cap NODE NODE = …` and `element gm NODE[, NODE] -> NODE = … [inverting]`: any extra linear element.
import { si } from '../../units';
import { closest } from '../closestWord';
import { quote } from '../diagnostics';
import { spanRange, tokenRange, type Token } from '../lexer';
import type { NodeRef } from '../model';
import { NOTHING } from '../modelParts';
import { sameRef } from '../nodeRefs';
import type { PolaritySyntax, StatementCommon } from '../syntax';
import { attached, sensed, type FieldSpec, type StatementDescriptor } from './statementKind';

export const ELEMENT_KINDS = ['res', 'cap', 'gm'] as const;
export type ElementKind = (typeof ELEMENT_KINDS)[number];

/** The value after `=`, by element kind. */
const ELEMENT_VALUES: Readonly<Record<ElementKind, FieldSpec>> = {
  res: { name: 'value', unit: 'ohm', role: 'res' },
  cap: { name: 'value', unit: 'F', role: 'cap-board' },
  gm: { name: 'value', unit: 'S', role: 'gm' },
};

export type ElementStatement = StatementCommon & {
  readonly kind: 'element';
  readonly element?: ElementKind;
  /** The first node; for `gm`, the one sensed. */
  readonly a?: Token;
  /** For `gm P, N -> OUT`: the node sensed on the negative side. */
  readonly aN?: Token;
  /** The second node; for `gm`, the one driven. */
  readonly b?: Token;
  readonly polarity?: PolaritySyntax;
};

export const elementKind: StatementDescriptor<ElementStatement> = {
  keyword: 'element',
  fields: [],
  flags: ['inverting', 'noninverting'],
  connectors: [],
  variants: { words: ELEMENT_KINDS, detail: 'element kind' },
  overriddenByKeyword: false,
  parse(p, parts) {
    const k = p.name(() => `an element kind (${ELEMENT_KINDS.join(', ')})`);
    if (!(ELEMENT_KINDS as readonly string[]).includes(k.text)) {
      const near = closest(k.text, ELEMENT_KINDS);
      p.fail(
        `Unknown element kind ${quote(k.text)}; expected ${ELEMENT_KINDS.join(', ')}.${near ? ` Did you mean ${quote(near)}?` : ''}`,
        tokenRange(k),
      );
    }
    const element = k.text as ElementKind;
    parts.element = element;
    if (element === 'gm') {
      parts.a = p.name('the node the transconductance senses');
      if (p.c.isOp(',')) {
        p.c.next();
        parts.aN = p.name('the node sensed on the negative side (`gm P, N -> OUT` senses P − N)');
      }
      p.op('->', () => 'Expected `->` between the sensed node(s) and the driven node of `element gm`.');
      parts.b = p.name('the node the transconductance drives');
    } else {
      parts.a = p.name('the first node');
      parts.b = p.name('the second node');
    }
    const eq = p.op('=', () => `Missing \`=\` before the value of ${quote(`element ${element}`)}.`);
    p.addField(
      'value',
      k,
      p.expr(
        () => `Missing value for ${quote(`element ${element}`)}.`,
        () => tokenRange(eq),
      ),
    );
    p.fieldList();
  },
  nodes: (s) => [
    ...(s.element === 'gm' ? [...sensed(s.a), ...sensed(s.aN)] : attached(s.a)),
    ...attached(s.b),
  ],
  declares: () => [],
  build(s, ctx) {
    if (!s.element || !s.a || !s.b) return NOTHING;
    const a = ctx.resolveNode(s.a);
    const b = ctx.resolveNode(s.b);
    const r = ctx.field(s, ELEMENT_VALUES[s.element], `element ${s.element}`);
    if (r.status !== 'ok' || !a || !b) return NOTHING;
    const origin = ctx.origin(s, { value: r.origin });
    const selfLoop = (what: string): typeof NOTHING => {
      ctx.sink.error('reference', `This ${what} connects a node to itself.`, spanRange(s.a!, s.b!));
      return NOTHING;
    };
    switch (s.element) {
      case 'res':
        if (sameRef(a, b)) return selfLoop('resistor');
        return { elements: [{ kind: 'res', a, b, value: si(r.value), origin }] };
      case 'cap':
        if (sameRef(a, b)) return selfLoop('capacitor');
        return { elements: [{ kind: 'cap', a, b, value: si(r.value), origin }] };
      case 'gm': {
        const aN = s.aN ? ctx.resolveNode(s.aN) : undefined;
        if (s.aN && !aN) return NOTHING;
        if (aN && sameRef(a, aN)) {
          ctx.sink.error(
            'reference',
            'A transconductance cannot sense the same node on both sides.',
            tokenRange(s.aN!),
          );
          return NOTHING;
        }
        return {
          elements: [
            {
              kind: 'gm',
              control: a,
              ...(aN && aN.kind !== 'ground' ? { controlN: aN } : {}),
              output: b,
              value: si(r.value),
              polarity: s.polarity?.value ?? 'noninverting',
              origin,
            },
          ],
        };
      }
    }
    const _: never = s.element;
    return _;
  },
};

// `sweep NAME from LOW to HIGH [points N] [log | linear]`: a parameter of the design varied over a range.
// Several sweeps in one design are swept one at a time; each corner is swept too (see sweep/sweepDesign.ts).
import { closest } from '../closestWord';
import { quote } from '../diagnostics';
import { tokenRange, type Token } from '../lexer';
import type { SweepScale } from '../model';
import { NOTHING } from '../modelParts';
import type { StatementCommon } from '../syntax';
import { DIM } from '../unitTable';
import type { StatementDescriptor } from './statementKind';

export type SweepStatement = StatementCommon & {
  readonly kind: 'sweep';
  readonly name?: Token;
  /** `log` or `linear` when written; otherwise the scale follows from the bounds. */
  readonly scale?: Token;
};

export const SWEEP_SCALES = ['log', 'linear'] as const;
/** The number of points when `points N` is not written. */
export const DEFAULT_SWEEP_POINTS = 61;
/** Enough for any chart; more only slows the editor. */
export const MAX_SWEEP_POINTS = 2001;

export const sweepKind: StatementDescriptor<SweepStatement> = {
  keyword: 'sweep',
  fields: [],
  flags: [],
  connectors: ['from', 'to', 'points', ...SWEEP_SCALES],
  overriddenByKeyword: false,
  parse(p, parts) {
    const name = (parts.name = p.name('the name of a parameter to sweep'));
    const word = (w: string, example: string): Token => {
      const t = p.c.peek();
      if (t?.kind === 'ident' && t.text === w) return p.c.next()!;
      return p.fail(
        t ? `Expected \`${w}\`, found ${quote(t.text)} (${example}).` : `Missing \`${w}\` (${example}).`,
        t ? tokenRange(t) : p.lastRange(),
      );
    };
    const example = `e.g. \`sweep ${name.text} from 1 pF to 1 nF\``;
    const from = word('from', example);
    p.addField(
      'low',
      from,
      p.expr(
        () => 'Missing the lower end after `from`.',
        () => tokenRange(from),
      ),
    );
    const to = word('to', example);
    p.addField(
      'high',
      to,
      p.expr(
        () => 'Missing the upper end after `to`.',
        () => tokenRange(to),
      ),
    );
    while (!p.c.atEnd()) {
      const t = p.c.peek()!;
      if (t.kind === 'ident' && t.text === 'points') {
        p.c.next();
        p.addField(
          'points',
          t,
          p.expr(
            () => 'Missing the number of points after `points`.',
            () => tokenRange(t),
          ),
        );
      } else if (t.kind === 'ident' && (SWEEP_SCALES as readonly string[]).includes(t.text)) {
        p.c.next();
        if (parts.scale) p.fail(`The scale is already given as ${quote(parts.scale.text)}.`, tokenRange(t));
        parts.scale = t;
      } else {
        p.fail(`Expected \`points N\`, \`log\` or \`linear\`, found ${quote(t.text)}.`, tokenRange(t));
      }
    }
    p.finish();
  },
  nodes: () => [],
  declares: () => [],
  build(s, ctx) {
    const name = s.name!;
    const param = ctx.scope.params.get(name.text);
    if (!param) {
      const near = closest(name.text, ctx.scope.params.keys());
      ctx.sink.error(
        'reference',
        `Unknown parameter ${quote(name.text)}: a sweep varies a \`param\` of the design.${near ? ` Did you mean ${quote(near)}?` : ''}`,
        tokenRange(name),
      );
      return NOTHING;
    }
    if (ctx.scope.skipped.has(param)) return NOTHING;
    const own = ctx.quantity(param, 'value');
    const low = ctx.quantity(s, 'low');
    const high = ctx.quantity(s, 'high');
    if (!own || !low || !high) return NOTHING;
    // A point writes the parameter as one literal in an SI unit, so its dimension needs a unit word.
    if (own.dimension !== '1' && (own.dimension === 'ugf' || !(own.dimension in DIM))) {
      ctx.sink.error(
        'unit',
        `A sweep writes ${quote(name.text)} as a number with a unit, and a quantity in ${own.dimension} has no unit word; sweep a parameter it is derived from.`,
        tokenRange(name),
      );
      return NOTHING;
    }
    const lowExpr = s.fields.find((f) => f.name === 'low')!.expr;
    const highExpr = s.fields.find((f) => f.name === 'high')!.expr;
    for (const [b, e] of [
      [low, lowExpr],
      [high, highExpr],
    ] as const) {
      if (b.dimension !== own.dimension && !(b.value === 0 && b.dimension === '1')) {
        ctx.sink.error(
          'unit',
          `An end of the sweep of ${quote(name.text)} must be the same kind of quantity as its value (${own.dimension === '1' ? 'a plain number' : own.dimension}); this is ${b.dimension === '1' ? 'a plain number' : b.dimension}.`,
          e.range,
        );
        return NOTHING;
      }
    }
    const bounds = { start: lowExpr.range.start, end: highExpr.range.end };
    if (!(low.value < high.value)) {
      ctx.sink.error('syntax', `The lower end of the sweep must be below the upper end.`, bounds);
      return NOTHING;
    }
    let points = DEFAULT_SWEEP_POINTS;
    if (s.fields.some((f) => f.name === 'points')) {
      const n = ctx.quantity(s, 'points');
      if (!n) return NOTHING;
      const expr = s.fields.find((f) => f.name === 'points')!.expr;
      if (n.dimension !== '1' || !Number.isInteger(n.value) || n.value < 2 || n.value > MAX_SWEEP_POINTS) {
        ctx.sink.error(
          'syntax',
          `The number of points must be a whole number from 2 to ${MAX_SWEEP_POINTS}.`,
          expr.range,
        );
        return NOTHING;
      }
      points = n.value;
    }
    const positive = low.value > 0 && high.value > 0;
    const scale: SweepScale = s.scale
      ? (s.scale.text as SweepScale)
      : positive && high.value / low.value > 10
        ? 'log'
        : 'linear';
    if (scale === 'log' && !positive) {
      ctx.sink.error(
        'syntax',
        'A logarithmic sweep needs both ends above zero; write `linear` or move the ends.',
        s.scale ? tokenRange(s.scale) : bounds,
      );
      return NOTHING;
    }
    // The sweep sets the parameter in every corner too: a corner's own value for it is not used.
    for (const corner of ctx.scope.corners.values())
      for (const o of corner.overrides)
        if (!o.field && o.target.text === name.text) {
          ctx.sink.warning(
            'syntax',
            `The sweep of ${quote(name.text)} sets it in this corner too: this value is not used in the sweep.`,
            o.targetRange,
          );
        }
    return {
      sweeps: [
        {
          param: name.text,
          dimension: own.dimension,
          low: low.value,
          high: high.value,
          points,
          scale,
          origin: ctx.origin(s, { low: low.origin, high: high.origin }),
        },
      ],
    };
  },
};

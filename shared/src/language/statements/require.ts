// `require KIND >= value` (or `<=`), `require zero >= N * ugf`, `require settle TOL within TIME`: what the
// design must meet.
import { si } from '../../units';
import { closest } from '../closestWord';
import { quote } from '../diagnostics';
import { tokenRange, type Token } from '../lexer';
import type { Comparison, Requirement } from '../model';
import { NOTHING } from '../modelParts';
import type { StatementParser } from '../statementParser';
import type { StatementCommon } from '../syntax';
import type { BuildContext, Draft, FieldSpec, StatementDescriptor } from './statementKind';

export const REQUIREMENT_KINDS = ['ugf', 'pm', 'gainmargin', 'zero', 'slew', 'settle', 'dcgain'] as const;
export type RequirementWord = (typeof REQUIREMENT_KINDS)[number];

type Bound = Exclude<RequirementWord, 'zero' | 'settle'>;

/** The value after `>=` or `<=`, by requirement; it is named after the requirement in messages. */
const BOUND_VALUES: Readonly<Record<Bound, FieldSpec>> = {
  ugf: { name: 'value', unit: 'Hz', role: 'ugf' },
  pm: { name: 'value', unit: 'deg', role: 'pm' },
  gainmargin: { name: 'value', unit: 'dB', role: 'gainmargin' },
  slew: { name: 'value', unit: 'V/s', role: 'slew' },
  dcgain: { name: 'value', unit: 'dB', role: 'dcgain' },
};
const ZERO_FACTOR: FieldSpec = { name: 'factor', unit: 'ugf', role: 'zero' };
const SETTLE_TOLERANCE: FieldSpec = { name: 'tolerance', unit: 'one', role: 'tolerance' };
const SETTLE_WITHIN: FieldSpec = { name: 'within', unit: 's', role: 'within' };

export type RequireStatement = StatementCommon & {
  readonly kind: 'require';
  readonly requirement?: RequirementWord;
  readonly requirementToken?: Token;
  readonly op?: Comparison;
};

export const requireKind: StatementDescriptor<RequireStatement> = {
  keyword: 'require',
  fields: [],
  flags: [],
  connectors: ['within'],
  variants: { words: REQUIREMENT_KINDS, detail: 'requirement' },
  overriddenByKeyword: false,
  parse: parseRequirement,
  nodes: () => [],
  declares: () => [],
  build(s, ctx) {
    const requirement = buildRequirement(s, ctx);
    return requirement ? { requirements: [requirement] } : NOTHING;
  },
};

function parseRequirement(p: StatementParser, parts: Draft<RequireStatement>): void {
  const k = p.name(() => `a requirement (${REQUIREMENT_KINDS.join(', ')})`);
  if (!(REQUIREMENT_KINDS as readonly string[]).includes(k.text)) {
    const near = closest(k.text, REQUIREMENT_KINDS);
    p.fail(
      `Unknown requirement ${quote(k.text)}; expected ${REQUIREMENT_KINDS.join(', ')}.${near ? ` Did you mean ${quote(near)}?` : ''}`,
      tokenRange(k),
    );
  }
  const req = k.text as RequirementWord;
  parts.requirement = req;
  parts.requirementToken = k;
  if (req === 'settle') return parseSettle(p, k);
  const opToken = p.c.peek();
  const op =
    opToken?.kind === 'op' && (opToken.text === '>=' || opToken.text === '<=') ? opToken.text : undefined;
  if (!op) {
    const strict = opToken?.text === '>' || opToken?.text === '<';
    p.fail(
      `Expected \`>=\` or \`<=\` after ${quote(req)}.` +
        (strict ? ` A requirement includes its bound: write \`${opToken!.text}=\`.` : ''),
      opToken ? tokenRange(opToken) : tokenRange(k),
    );
  }
  if (req === 'zero' && op === '<=')
    p.fail('A zero requirement is a lower bound: write `require zero >= 10 * ugf`.', tokenRange(opToken!));
  p.c.next();
  parts.op = op;
  const field = req === 'zero' ? ZERO_FACTOR.name : 'value';
  p.addField(
    field,
    k,
    p.expr(
      () => `Missing the value after ${quote(op)}.`,
      () => tokenRange(opToken!),
    ),
  );
  p.finish();
}

/** `settle TOL within TIME`. */
function parseSettle(p: StatementParser, k: Token): void {
  const tol = p.expr(
    () => 'Missing the tolerance after `settle` (e.g. `0.1 %`).',
    () => tokenRange(k),
  );
  p.addField(SETTLE_TOLERANCE.name, k, tol);
  const w = p.c.peek();
  if (!w || w.kind !== 'ident' || w.text !== 'within')
    p.fail(
      'Expected `within` and a time after the tolerance (e.g. `within 200 ns`).',
      w ? tokenRange(w) : tol.range,
    );
  p.c.next();
  p.addField(
    SETTLE_WITHIN.name,
    w,
    p.expr(
      () => 'Missing the time after `within`.',
      () => tokenRange(w),
    ),
  );
  p.finish();
}

function buildRequirement(s: RequireStatement, ctx: BuildContext): Requirement | undefined {
  const kind = s.requirement;
  if (!kind) return undefined;
  const op = s.op ?? '>=';
  switch (kind) {
    case 'settle':
      return buildSettle(s, ctx);
    case 'zero': {
      const r = ctx.field(s, ZERO_FACTOR, 'zero');
      if (r.status !== 'ok') return undefined;
      return { kind: 'zero', op: '>=', factor: si(r.value), origin: ctx.origin(s, { factor: r.origin }) };
    }
    case 'ugf':
    case 'pm':
    case 'gainmargin':
    case 'slew':
    case 'dcgain': {
      const r = ctx.field(s, BOUND_VALUES[kind], kind);
      if (r.status !== 'ok') return undefined;
      return bound(kind, op, r.value, ctx.origin(s, { value: r.origin }));
    }
  }
  const _: never = kind;
  return _;
}

function bound(kind: Bound, op: Comparison, value: number, origin: Requirement['origin']): Requirement {
  switch (kind) {
    case 'ugf':
      return { kind, op, value: si(value), origin };
    case 'pm':
      return { kind, op, value: si(value), origin };
    case 'gainmargin':
      return { kind: 'gain-margin', op, value: si(value), origin };
    case 'slew':
      return { kind, op, value: si(value), origin };
    case 'dcgain':
      return { kind: 'dc-gain', op, value: si(value), origin };
  }
  const _: never = kind;
  return _;
}

function buildSettle(s: RequireStatement, ctx: BuildContext): Requirement | undefined {
  const tol = ctx.field(s, SETTLE_TOLERANCE);
  const within = ctx.field(s, SETTLE_WITHIN);
  if (tol.status !== 'ok' || within.status !== 'ok') return undefined;
  // A plain number of 1 % or more is probably a percentage written without its `%`.
  const written = ctx.writtenExpr(s, SETTLE_TOLERANCE.name);
  if (written?.kind === 'number' && written.unitText === undefined && tol.value >= 0.01)
    ctx.sink.warning(
      'plausibility',
      `A plain tolerance is a fraction: ${written.numberText} is ${Number((tol.value * 100).toPrecision(6))} %. Write ${quote(`${written.numberText} %`)} if you meant percent.`,
      written.range,
    );
  return {
    kind: 'settle',
    tolerance: si(tol.value),
    within: si(within.value),
    origin: ctx.origin(s, { tolerance: tol.origin, within: within.origin }),
  };
}

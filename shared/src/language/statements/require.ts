// `require KIND >= value` (or `<=`), `require zero >= N * ugf`, `require settle TOL within TIME [step
// AMPLITUDE]`: what the design must meet.
import { si, type Volts } from '../../units';
import { closest } from '../closestWord';
import { quote } from '../diagnostics';
import { tokenRange, type Token } from '../lexer';
import type { Comparison, FieldOrigin, Requirement } from '../model';
import type { Hertz } from '../../units';
import { NOTHING } from '../modelParts';
import type { StatementParser } from '../statementParser';
import type { StatementCommon } from '../syntax';
import {
  sensed,
  type BuildContext,
  type Draft,
  type FieldSpec,
  type StatementDescriptor,
} from './statementKind';

export const REQUIREMENT_KINDS = [
  'ugf',
  'pm',
  'gainmargin',
  'zero',
  'slew',
  'settle',
  'dcgain',
  'clgain',
  'zout',
  'psrr',
  'loadstep',
] as const;
export type RequirementWord = (typeof REQUIREMENT_KINDS)[number];

/** Requirements of a loop closed by the circuit itself, with their parts after the bound. */
type CircuitWord = 'zout' | 'psrr' | 'loadstep';
type Bound = Exclude<RequirementWord, 'zero' | 'settle' | CircuitWord>;

/** The only comparison each closed-circuit requirement takes, and its parts after the value. */
const CIRCUIT_WORDS: Readonly<
  Record<CircuitWord, { readonly op: Comparison; readonly value: FieldSpec; readonly example: string }>
> = {
  zout: {
    op: '<=',
    value: { name: 'value', unit: 'ohm', role: 'zout' },
    example: 'require zout <= 0.1 ohm at 100 kHz',
  },
  psrr: {
    op: '>=',
    value: { name: 'value', unit: 'dB', role: 'psrr' },
    example: 'require psrr >= 40 dB at 10 kHz',
  },
  loadstep: {
    op: '<=',
    value: { name: 'value', unit: 'V', role: 'deviation' },
    example: 'require loadstep <= 30 mV for 10 mA',
  },
};
const AT_FREQUENCY: FieldSpec = { name: 'at', unit: 'Hz', role: 'at-frequency' };
const STEP_CURRENT: FieldSpec = { name: 'for', unit: 'A', role: 'load-step' };

/** The value after `>=` or `<=`, by requirement; it is named after the requirement in messages. */
const BOUND_VALUES: Readonly<Record<Bound, FieldSpec>> = {
  ugf: { name: 'value', unit: 'Hz', role: 'ugf' },
  pm: { name: 'value', unit: 'deg', role: 'pm' },
  gainmargin: { name: 'value', unit: 'dB', role: 'gainmargin' },
  slew: { name: 'value', unit: 'V/s', role: 'slew' },
  dcgain: { name: 'value', unit: 'dB', role: 'dcgain' },
  clgain: { name: 'value', unit: 'dB', role: 'clgain' },
};
const ZERO_FACTOR: FieldSpec = { name: 'factor', unit: 'ugf', role: 'zero' };
const SETTLE_TOLERANCE: FieldSpec = { name: 'tolerance', unit: 'one', role: 'tolerance' };
const SETTLE_WITHIN: FieldSpec = { name: 'within', unit: 's', role: 'within' };
/** `step AMPLITUDE`: the input step (volts) the settling is judged for, with the stages' currents limited. */
const SETTLE_STEP: FieldSpec = { name: 'step', unit: 'V', role: 'step' };

export type RequireStatement = StatementCommon & {
  readonly kind: 'require';
  readonly requirement?: RequirementWord;
  readonly requirementToken?: Token;
  readonly op?: Comparison;
  /** `from NODE` of `require psrr`: the supply it is judged for. */
  readonly supply?: Token;
};

export const requireKind: StatementDescriptor<RequireStatement> = {
  keyword: 'require',
  fields: [],
  flags: [],
  connectors: ['at', 'for', 'from', 'within', 'step'],
  variants: { words: REQUIREMENT_KINDS, detail: 'requirement' },
  overriddenByKeyword: false,
  parse: parseRequirement,
  nodes: (s) => sensed(s.supply),
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
  if (isCircuitWord(req) && op !== CIRCUIT_WORDS[req].op)
    p.fail(
      `${quote(req)} takes only \`${CIRCUIT_WORDS[req].op}\`: write \`${CIRCUIT_WORDS[req].example}\`.`,
      tokenRange(opToken!),
    );
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
  if (isCircuitWord(req)) parseCircuitParts(p, parts, req);
  p.finish();
}

const isCircuitWord = (w: RequirementWord): w is CircuitWord => w in CIRCUIT_WORDS;

/** `at FREQ` (zout optional, psrr required), `from NODE` (psrr), `for CURRENT` (loadstep, required). */
function parseCircuitParts(p: StatementParser, parts: Draft<RequireStatement>, req: CircuitWord): void {
  const allowed = req === 'loadstep' ? ['for'] : req === 'psrr' ? ['at', 'from'] : ['at'];
  const seen = new Set<string>();
  while (!p.c.atEnd()) {
    const w = p.c.peek()!;
    if (w.kind !== 'ident' || !allowed.includes(w.text))
      p.fail(`Unexpected ${quote(w.text)}: write \`${CIRCUIT_WORDS[req].example}\`.`, tokenRange(w));
    if (seen.has(w.text)) p.fail(`${quote(w.text)} is given twice.`, tokenRange(w));
    seen.add(w.text);
    p.c.next();
    if (w.text === 'from') {
      parts.supply = p.name('the supply node');
      continue;
    }
    p.addField(
      w.text,
      w,
      p.expr(
        () => `Missing the ${w.text === 'at' ? 'frequency' : 'current step'} after ${quote(w.text)}.`,
        () => tokenRange(w),
      ),
    );
  }
  const needed = req === 'loadstep' ? 'for' : req === 'psrr' ? 'at' : undefined;
  if (needed && !seen.has(needed))
    p.fail(
      `${quote(req)} needs ${quote(needed)} and a ${needed === 'at' ? 'frequency' : 'current step'}: write \`${CIRCUIT_WORDS[req].example}\`.`,
      p.lastRange(),
    );
}

/** `settle TOL within TIME [step AMPLITUDE]`. */
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
  const st = p.c.peek();
  if (st?.kind === 'ident' && st.text === 'step') {
    p.c.next();
    p.addField(
      SETTLE_STEP.name,
      st,
      p.expr(
        () => 'Missing the step amplitude after `step` (e.g. `step 1 V`).',
        () => tokenRange(st),
      ),
    );
  }
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
    case 'zout':
    case 'psrr':
    case 'loadstep':
      return buildCircuitRequirement(s, kind, ctx);
    case 'ugf':
    case 'pm':
    case 'gainmargin':
    case 'slew':
    case 'dcgain':
    case 'clgain': {
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
    case 'clgain':
      return { kind: 'closed-loop-gain', op, value: si(value), origin };
  }
  const _: never = kind;
  return _;
}

function buildSettle(s: RequireStatement, ctx: BuildContext): Requirement | undefined {
  const tol = ctx.field(s, SETTLE_TOLERANCE);
  const within = ctx.field(s, SETTLE_WITHIN);
  const step = s.fields.some((f) => f.name === SETTLE_STEP.name) ? ctx.field(s, SETTLE_STEP) : undefined;
  if (tol.status !== 'ok' || within.status !== 'ok' || (step && step.status !== 'ok')) return undefined;
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
    ...(step?.status === 'ok' ? { step: si<Volts>(step.value) } : {}),
    origin: ctx.origin(s, {
      tolerance: tol.origin,
      within: within.origin,
      ...(step?.status === 'ok' ? { step: step.origin } : {}),
    }),
  };
}

function buildCircuitRequirement(
  s: RequireStatement,
  word: CircuitWord,
  ctx: BuildContext,
): Requirement | undefined {
  const v = ctx.field(s, CIRCUIT_WORDS[word].value, word);
  if (v.status !== 'ok') return undefined;
  switch (word) {
    case 'zout': {
      const at = ctx.field(s, AT_FREQUENCY, 'at');
      if (at.status === 'failed') return undefined;
      const origins: Record<string, FieldOrigin> =
        at.status === 'ok' ? { value: v.origin, at: at.origin } : { value: v.origin };
      return {
        kind: 'output-impedance',
        op: '<=',
        value: si(v.value),
        ...(at.status === 'ok' ? { atHz: si<Hertz>(at.value) } : {}),
        origin: ctx.origin(s, origins),
      };
    }
    case 'psrr': {
      const at = ctx.field(s, AT_FREQUENCY, 'at');
      if (at.status !== 'ok') return undefined;
      const supply = s.supply ? ctx.resolveNodeName(s.supply, 'The supply') : undefined;
      if (s.supply && !supply) return undefined;
      if (s.supply && supply && ctx.scope.decls.get(supply)?.statement.kind !== 'supply') {
        ctx.sink.error(
          'reference',
          `${quote(supply)} is not a supply: declare it with \`supply ${supply}\`, or name one that is.`,
          tokenRange(s.supply),
        );
        return undefined;
      }
      return {
        kind: 'supply-rejection',
        op: '>=',
        value: si(v.value),
        atHz: si(at.value),
        ...(supply ? { supply } : {}),
        origin: ctx.origin(s, { value: v.origin, at: at.origin }),
      };
    }
    case 'loadstep': {
      const step = ctx.field(s, STEP_CURRENT, 'for');
      if (step.status !== 'ok') return undefined;
      return {
        kind: 'load-step',
        op: '<=',
        value: si(v.value),
        step: si(step.value),
        origin: ctx.origin(s, { value: v.origin, for: step.origin }),
      };
    }
  }
}

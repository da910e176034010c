// One line inside a design → one statement. A syntax error stops that statement only: it is reported once,
// the statement is marked broken, and the next line starts afresh.
import { DiagnosticSink, quote } from './diagnostics';
import { Cursor, parseExpression, type ExpressionContext, type Expr } from './expression';
import { spanRange, tokenEnd, tokenRange, type LexedLine, type Token } from './lexer';
import type { Comparison, Polarity } from './model';
import type { SourceRange } from './source';
import type { FieldSyntax, OverrideSyntax, PolaritySyntax, Statement } from './syntax';
import {
  closest,
  ELEMENT_KINDS,
  FIELDS_BY_STATEMENT,
  FLAGS_BY_STATEMENT,
  REQUIREMENT_KINDS,
  STATEMENT_KEYWORDS,
  type ElementKind,
  type RequirementWord,
} from './vocabulary';

const ALL_FIELDS = new Set(Object.values(FIELDS_BY_STATEMENT).flat());
// Words that may follow a value on the same line; any other word right after a number is read as its unit.
const STOP_WORDS: ReadonlySet<string> = new Set([
  ...ALL_FIELDS,
  ...Object.values(FLAGS_BY_STATEMENT).flat(),
  'from',
  'at',
  'within',
]);
/** Words that cannot name a parameter, stage, node or corner. */
// Field names (`cc`, `gm`) and element and requirement words stay usable as names: where they appear
// decides what they mean (`param cc = 1 pF` … `cc = cc`).
export const RESERVED_NAMES: ReadonlySet<string> = new Set([
  'design',
  'end',
  ...STATEMENT_KEYWORDS,
  'from',
  'at',
  'within',
  'inverting',
  'noninverting',
  'ugf',
  'in',
  'gnd',
]);

class Stop extends Error {}

class StatementParser {
  readonly c: Cursor;
  readonly ctx: ExpressionContext;
  broken = false;
  readonly fields: FieldSyntax[] = [];
  polarity?: PolaritySyntax;

  constructor(
    readonly line: LexedLine,
    readonly text: string,
    readonly sink: DiagnosticSink,
    readonly keyword: Token,
  ) {
    this.c = new Cursor(line.tokens);
    this.c.pos = 1;
    this.ctx = { sink, stopWords: STOP_WORDS };
  }

  /** Report a syntax error that ends this statement. */
  fail(message: string, range: SourceRange): never {
    this.sink.error('syntax', message, range);
    this.broken = true;
    throw new Stop();
  }

  /** The range to blame when something is missing: the last token read (or the keyword). */
  lastRange(): SourceRange {
    return tokenRange(this.c.last() ?? this.keyword);
  }

  name(what: string | (() => string)): Token {
    const t = this.c.peek();
    if (t?.kind === 'ident') {
      this.c.next();
      return t;
    }
    const w = typeof what === 'string' ? what : what();
    if (!t) this.fail(`Missing ${w} after ${quote(this.c.last()!.text)}.`, this.lastRange());
    this.fail(`Expected ${w}, found ${quote(t.text)}.`, tokenRange(t));
  }

  // Messages are thunks: they are only built when something is wrong, which keeps parsing cheap.
  op(text: string, message: () => string): Token {
    const t = this.c.peek();
    if (!t || t.kind !== 'op' || t.text !== text) this.fail(message(), t ? tokenRange(t) : this.lastRange());
    return this.c.next()!;
  }

  expr(missing: () => string, blame: () => SourceRange): Expr {
    const e = parseExpression(this.c, this.ctx);
    if (!e) this.fail(missing(), blame());
    return e;
  }

  exprText(e: Expr): string {
    return this.text.slice(e.range.start.character, e.range.end.character);
  }

  addField(name: string, nameToken: Token, expr: Expr): void {
    const first = this.fields.find((f) => f.name === name);
    if (first) {
      this.sink.error(
        'syntax',
        `${quote(name)} is given twice; the first value is used.`,
        tokenRange(nameToken),
        [{ range: tokenRange(first.nameToken), message: `first ${quote(name)}` }],
      );
      return;
    }
    this.fields.push({ name, nameToken, expr, text: this.exprText(expr) });
  }

  setPolarity(t: Token): void {
    if (this.polarity) {
      this.sink.error(
        'syntax',
        `The polarity is already given as ${quote(this.polarity.value)}.`,
        tokenRange(t),
        [{ range: tokenRange(this.polarity.token), message: 'first polarity' }],
      );
      return;
    }
    this.polarity = { value: t.text as Polarity, token: t };
  }

  /**
   * Reads `name = value` fields and flags until the end of the line. `extra` handles statement-specific
   * words (`from NODE`, `at NODE`) and returns true when it consumed one.
   */
  fieldList(kind: string, extra?: (t: Token) => boolean): void {
    const allowed = FIELDS_BY_STATEMENT[kind] ?? [];
    const flags = FLAGS_BY_STATEMENT[kind] ?? [];
    while (!this.c.atEnd()) {
      const t = this.c.peek()!;
      if (t.kind === 'ident' && allowed.includes(t.text)) {
        this.c.next();
        if (!this.c.isOp('=')) this.fail(`Missing \`=\` after ${quote(t.text)}.`, tokenRange(t));
        const eq = this.c.next()!;
        this.addField(
          t.text,
          t,
          this.expr(
            () => `Missing value for ${quote(t.text)}.`,
            () => spanRange(t, eq),
          ),
        );
        continue;
      }
      if (t.kind === 'ident' && flags.includes(t.text)) {
        this.c.next();
        this.setPolarity(t);
        continue;
      }
      if (t.kind === 'ident' && extra?.(t)) continue;
      const prev = this.c.last();
      if (t.kind === 'op' && t.text === ',' && prev?.kind === 'number' && this.c.peek(1)?.kind === 'number')
        this.fail('Unexpected `,` in a number: the decimal separator is `.` (`1.5 mS`).', tokenRange(t));
      const list = allowed.length ? ` (${kind} takes ${[...allowed, ...flags].join(', ')})` : '';
      if (t.kind === 'ident' && this.c.isOp('=', 1)) {
        const near = closest(t.text, allowed);
        this.fail(
          `Unknown field ${quote(t.text)}${list}.${near ? ` Did you mean ${quote(near)}?` : ''}`,
          tokenRange(t),
        );
      }
      const near = t.kind === 'ident' ? closest(t.text, [...allowed, ...flags]) : undefined;
      this.fail(
        `Unexpected ${quote(t.text)}${list}.${near ? ` Did you mean ${quote(near)}?` : ''}`,
        tokenRange(t),
      );
    }
  }

  /** Nothing may follow the statement. */
  finish(): void {
    const t = this.c.peek();
    if (t) this.fail(`Unexpected ${quote(t.text)} at the end of the statement.`, tokenRange(t));
  }

  nodePair(what: string): { from: Token; to: Token } {
    const from = this.name(() => `the node ${what} starts from`);
    this.op('->', () => `Expected \`->\` between the two nodes of ${quote(this.keyword.text)}.`);
    const to = this.name(() => `the node ${what} goes to`);
    return { from, to };
  }
}

/** Parses one non-empty line inside a design. Returns `undefined` for an unknown statement (reported). */
export function parseStatement(line: LexedLine, text: string, sink: DiagnosticSink): Statement | undefined {
  const keyword = line.tokens[0]!;
  if (keyword.kind !== 'ident' || !(STATEMENT_KEYWORDS as readonly string[]).includes(keyword.text)) {
    const near = keyword.kind === 'ident' ? closest(keyword.text, STATEMENT_KEYWORDS) : undefined;
    sink.error(
      'syntax',
      `Unknown statement ${quote(keyword.text)}.${near ? ` Did you mean ${quote(near)}?` : ''} A design holds: ${STATEMENT_KEYWORDS.join(', ')}; it closes with \`end\`.`,
      tokenRange(keyword),
    );
    return undefined;
  }
  const p = new StatementParser(line, text, sink, keyword);
  const kind = keyword.text as Statement['kind'];
  const parts: Record<string, unknown> = { kind };
  try {
    switch (kind) {
      case 'param': {
        parts.name = p.name('a parameter name');
        const eq = p.op(
          '=',
          () => `Missing \`=\` after the parameter name ${quote((parts.name as Token).text)}.`,
        );
        p.addField(
          'value',
          eq,
          p.expr(
            () => `Missing value for ${quote((parts.name as Token).text)}.`,
            () => tokenRange(eq),
          ),
        );
        p.finish();
        break;
      }
      case 'node': {
        const names: Token[] = [];
        parts.names = names;
        names.push(p.name('a node name'));
        while (!p.c.atEnd()) {
          if (p.c.isOp(',')) p.c.next();
          names.push(p.name('a node name'));
        }
        break;
      }
      case 'stage':
        parts.name = p.name('a stage name');
        p.fieldList('stage', (t) => {
          if (t.text !== 'from') return false;
          if (parts.from) p.fail('`from` is given twice.', tokenRange(t));
          p.c.next();
          parts.from = p.name('the node that drives this stage');
          return true;
        });
        break;
      case 'load':
        p.fieldList('load', (t) => {
          if (t.text !== 'at') return false;
          if (parts.at) p.fail('`at` is given twice.', tokenRange(t));
          p.c.next();
          parts.at = p.name('the node the load sits at');
          return true;
        });
        break;
      case 'miller':
      case 'indirect':
      case 'feedforward':
        Object.assign(parts, p.nodePair(kind === 'feedforward' ? 'the path' : 'the capacitor'));
        p.fieldList(kind);
        break;
      case 'element': {
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
          const { from, to } = p.nodePair('the transconductance');
          parts.a = from;
          parts.b = to;
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
        p.fieldList('element');
        break;
      }
      case 'output':
        parts.node = p.name('the output node');
        p.finish();
        break;
      case 'feedback':
        p.fieldList('feedback');
        break;
      case 'require':
        parseRequirement(p, parts);
        break;
      case 'corner':
        parts.name = p.name('a corner name');
        parts.overrides = [];
        parseOverrides(p, parts.overrides as OverrideSyntax[]);
        break;
    }
  } catch (e) {
    if (!(e instanceof Stop)) throw e;
  }
  const lastToken = line.tokens[line.tokens.length - 1]!;
  parts.overrides ??= kind === 'corner' ? [] : undefined;
  if (kind === 'node') parts.names ??= [];
  if (p.polarity) parts.polarity = p.polarity;
  parts.keyword = keyword;
  parts.range = spanRange(keyword, lastToken);
  parts.insertAt = tokenEnd(lastToken);
  parts.fields = p.fields;
  parts.broken = p.broken;
  return parts as unknown as Statement;
}

function parseRequirement(p: StatementParser, parts: Record<string, unknown>): void {
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
  if (req === 'settle') {
    const tol = p.expr(
      () => 'Missing the tolerance after `settle` (e.g. `0.1 %`).',
      () => tokenRange(k),
    );
    p.addField('tolerance', k, tol);
    const w = p.c.peek();
    if (!w || w.kind !== 'ident' || w.text !== 'within')
      p.fail(
        'Expected `within` and a time after the tolerance (e.g. `within 200 ns`).',
        w ? tokenRange(w) : tol.range,
      );
    p.c.next();
    p.addField(
      'within',
      w,
      p.expr(
        () => 'Missing the time after `within`.',
        () => tokenRange(w),
      ),
    );
    p.finish();
    return;
  }
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
  parts.op = op as Comparison;
  const field = req === 'zero' ? 'factor' : 'value';
  p.addField(
    field,
    k,
    p.expr(
      () => `Missing the value after ${quote(op!)}.`,
      () => tokenRange(opToken!),
    ),
  );
  p.finish();
}

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

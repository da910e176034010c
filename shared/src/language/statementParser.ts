// Reads the parts of one statement's line: names, operators, expressions, `name = value` fields and flags.
// A syntax error is reported once and ends the statement (`fail`); what was read before it is kept.
import { quote, type DiagnosticSink } from './diagnostics';
import { Cursor, parseExpression, type ExpressionContext, type Expr } from './expression';
import { spanRange, tokenRange, type LexedLine, type Token } from './lexer';
import type { Polarity } from './model';
import type { SourceRange } from './source';
import type { FieldSyntax, PolaritySyntax } from './syntax';
import { closest } from './closestWord';

/** The words one kind of statement accepts after its keyword. */
export interface StatementWords {
  readonly fields: readonly string[];
  readonly flags: readonly string[];
}

/** Thrown by `fail`: ends the statement; the parser catches it. */
export class Stop extends Error {}

export class StatementParser {
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
    /** The words of this statement's kind: its `name = value` fields and its flags. */
    readonly words: StatementWords,
    stopWords: ReadonlySet<string>,
  ) {
    this.c = new Cursor(line.tokens);
    this.c.pos = 1;
    this.ctx = { sink, stopWords };
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
  fieldList(extra?: (t: Token) => boolean): void {
    const kind = this.keyword.text;
    const allowed = this.words.fields;
    const flags = this.words.flags;
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

  /**
   * `NAME, NAME …` to the end of the line (commas optional), at least one, pushed into `names` as they are
   * read, so that the names before a syntax error are kept.
   */
  nameList(what: string, names: Token[]): void {
    names.push(this.name(what));
    while (!this.c.atEnd()) {
      if (this.c.isOp(',')) this.c.next();
      names.push(this.name(what));
    }
  }

  nodePair(what: string): { from: Token; to: Token } {
    const from = this.name(() => `the node ${what} starts from`);
    this.op('->', () => `Expected \`->\` between the two nodes of ${quote(this.keyword.text)}.`);
    const to = this.name(() => `the node ${what} goes to`);
    return { from, to };
  }
}

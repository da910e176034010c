// The declarations of one design: which names exist and what declares them. Shared by the nominal
// evaluation and every corner, since corners change values, never names.
import { quote, type DiagnosticSink } from './diagnostics';
import { tokenRange, type Token } from './lexer';
import type { NodeName } from './model';
import { node } from './nodeName';
import { RESERVED_NAMES } from './parseStatement';
import { kindOf, type NameDeclaration, type StatementKind, type StatementOf } from './statements';
import type { DesignSyntax, Statement } from './syntax';

export type { StatementOf } from './statements';
export { node } from './nodeName';

export interface Declaration {
  readonly kind: 'param' | 'stage' | 'node';
  readonly token: Token;
  readonly statement: Statement;
}

/** Everything about a design that does not change between corners. */
export class DesignScope {
  readonly decls = new Map<string, Declaration>();
  readonly corners = new Map<string, StatementOf<'corner'>>();
  /** Statements left out of every model: broken, or a duplicate declaration. */
  readonly skipped = new Set<Statement>();
  readonly stages: StatementOf<'stage'>[] = [];
  readonly params = new Map<string, StatementOf<'param'>>();
  /** Names that a line with an unknown keyword probably declared (see DesignSyntax.tentativeNames). */
  readonly tentative: ReadonlySet<string>;

  constructor(
    readonly design: DesignSyntax,
    readonly sink: DiagnosticSink,
  ) {
    this.tentative = new Set(design.tentativeNames.map((t) => t.text));
    for (const s of design.statements) {
      if (s.broken) this.skipped.add(s);
      for (const d of kindOf(s).declares(s)) this.declareName(d);
    }
  }

  private declareName(d: NameDeclaration): void {
    switch (d.kind) {
      case 'param':
        if (this.declare('param', d.token, d.statement, true)) this.params.set(d.token.text, d.statement);
        return;
      case 'stage':
        if (this.declare('stage', d.token, d.statement, false)) this.stages.push(d.statement);
        return;
      case 'node':
        this.declare('node', d.token, d.statement, false);
        return;
      case 'corner':
        this.declareCorner(d.token, d.statement);
        return;
    }
    const _: never = d;
    return _;
  }

  private declare(kind: Declaration['kind'], token: Token, statement: Statement, isParam: boolean): boolean {
    const name = token.text;
    if (RESERVED_NAMES.has(name) || (isParam && name === 'out')) {
      const what = name === 'in' || name === 'gnd' || name === 'out' ? 'a built-in node' : 'a keyword';
      this.sink.error(
        'syntax',
        `${quote(name)} is ${what} and cannot be declared as a ${kind}.`,
        tokenRange(token),
      );
      this.skipped.add(statement);
      return false;
    }
    const first = this.decls.get(name);
    if (first) {
      this.sink.error(
        'reference',
        `${quote(name)} is already declared (as a ${first.kind}).`,
        tokenRange(token),
        [{ range: tokenRange(first.token), message: `first declaration of ${quote(name)}` }],
      );
      if (kind !== 'node') this.skipped.add(statement);
      return false;
    }
    this.decls.set(name, { kind, token, statement });
    return true;
  }

  /** Corners have names of their own, apart from parameters, stages and nodes. */
  private declareCorner(name: Token, s: StatementOf<'corner'>): void {
    if (RESERVED_NAMES.has(name.text)) {
      this.sink.error(
        'syntax',
        `${quote(name.text)} is a keyword and cannot name a corner.`,
        tokenRange(name),
      );
    } else if (this.corners.has(name.text)) {
      const first = this.corners.get(name.text)!;
      this.sink.error('reference', `Corner ${quote(name.text)} is already declared.`, tokenRange(name), [
        { range: tokenRange(first.name!), message: `first declaration of ${quote(name.text)}` },
      ]);
      this.skipped.add(s);
    } else this.corners.set(name.text, s);
  }

  /** Every node reference of the design, in text order. */
  get nodeRefs(): readonly Token[] {
    return (this.cachedRefs ??= this.design.statements.flatMap(nodeTokens));
  }
  private cachedRefs?: Token[];

  /** The output's name as written (`output NODE`, else the last stage, else `out`), before any checking. */
  outputName(): string {
    const written = this.design.statements.find((s) => s.kind === 'output');
    if (written?.kind === 'output' && written.node) return written.node.text;
    return this.stages.length ? this.stages[this.stages.length - 1]!.name!.text : 'out';
  }

  /** True when the text mentions `out` as a node anywhere (it is then a node of the design). */
  mentionsOut(): boolean {
    if (this.decls.has('out')) return false;
    return (this.cachedMentionsOut ??= this.nodeRefs.some((t) => t.text === 'out'));
  }
  private cachedMentionsOut?: boolean;

  /** The first statement of a kind that is not left out: the one used where a design takes only one. */
  firstLive<K extends StatementKind>(kind: K): StatementOf<K> | undefined {
    return this.design.statements.find((s): s is StatementOf<K> => s.kind === kind && !this.skipped.has(s));
  }

  /**
   * The node that drives a stage written without `from`: the stage written before it (even one with an
   * error, so that one mistake does not rewire the rest), and `in` for the first.
   */
  defaultInput(s: StatementOf<'stage'>): NodeName {
    if (!this.cachedInputs) {
      this.cachedInputs = new Map();
      let previous = node('in');
      for (const t of this.design.statements) {
        if (t.kind !== 'stage') continue;
        this.cachedInputs.set(t, previous);
        if (t.name && this.decls.get(t.name.text)?.statement === t) previous = node(t.name.text);
      }
    }
    return this.cachedInputs.get(s)!;
  }
  private cachedInputs?: Map<Statement, NodeName>;
}

/** The node names a statement refers to (not the ones it declares). */
export function nodeTokens(s: Statement): Token[] {
  return kindOf(s)
    .nodes(s)
    .map((m) => m.token);
}

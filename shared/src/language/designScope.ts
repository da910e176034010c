// The declarations of one design: which names exist and what declares them. Shared by the nominal
// evaluation and every corner, since corners change values, never names.
import { quote, type DiagnosticSink } from './diagnostics';
import { tokenRange, type Token } from './lexer';
import type { NodeName } from './model';
import { RESERVED_NAMES } from './parseStatement';
import type { DesignSyntax, Statement } from './syntax';

export type StatementOf<K extends Statement['kind']> = Extract<Statement, { kind: K }>;

export interface Declaration {
  readonly kind: 'param' | 'stage' | 'node';
  readonly token: Token;
  readonly statement: Statement;
}

/** Only the evaluator turns a checked name into a NodeName. */
export const node = (name: string): NodeName => name as NodeName;

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
      switch (s.kind) {
        case 'param':
          if (s.name && this.declare('param', s.name, s, true)) this.params.set(s.name.text, s);
          break;
        case 'stage':
          if (s.name && this.declare('stage', s.name, s, false)) this.stages.push(s);
          else this.skipped.add(s);
          break;
        case 'node':
          for (const n of s.names) this.declare('node', n, s, false);
          break;
        case 'corner':
          if (!s.name) break;
          if (RESERVED_NAMES.has(s.name.text)) {
            sink.error(
              'syntax',
              `${quote(s.name.text)} is a keyword and cannot name a corner.`,
              tokenRange(s.name),
            );
          } else if (this.corners.has(s.name.text)) {
            const first = this.corners.get(s.name.text)!;
            sink.error('reference', `Corner ${quote(s.name.text)} is already declared.`, tokenRange(s.name), [
              { range: tokenRange(first.name!), message: `first declaration of ${quote(s.name.text)}` },
            ]);
            this.skipped.add(s);
          } else this.corners.set(s.name.text, s);
          break;
        default:
          break;
      }
    }
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
}

/** The node names a statement refers to (not the ones it declares). */
export function nodeTokens(s: Statement): Token[] {
  const out: (Token | undefined)[] = [];
  switch (s.kind) {
    case 'stage':
      out.push(s.from);
      break;
    case 'load':
      out.push(s.at);
      break;
    case 'miller':
    case 'indirect':
    case 'feedforward':
      out.push(s.from, s.to);
      break;
    case 'element':
      out.push(s.a, s.b);
      break;
    case 'output':
      out.push(s.node);
      break;
    default:
      break;
  }
  return out.filter((t): t is Token => t !== undefined);
}

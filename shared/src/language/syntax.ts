// The syntax tree: one statement per line, every part with its exact range. Produced by parseStatement,
// read by the evaluator. Each statement kind's own parts are declared with its descriptor in statements/.
import type { Expr } from './expression';
import type { Token } from './lexer';
import type { SourcePosition, SourceRange } from './source';
import type { Polarity } from './model';
import type { Statement } from './statements';

export interface FieldSyntax {
  readonly name: string;
  readonly nameToken: Token;
  readonly expr: Expr;
  /** The expression's text as written. */
  readonly text: string;
}

/** What every statement has, whatever its kind. Each kind adds its own parts (see statements/). */
export interface StatementCommon {
  readonly keyword: Token;
  readonly range: SourceRange;
  readonly insertAt: SourcePosition;
  readonly fields: readonly FieldSyntax[];
  /** Set when a syntax error stopped the statement: its names still count, but it adds nothing to the model. */
  readonly broken: boolean;
}

export interface PolaritySyntax {
  readonly value: Polarity;
  readonly token: Token;
}

export type { Statement, StatementKind, StatementOf } from './statements';

/** One `target = value` of a corner: `gm1 = 120 uS` or `second.gm = 2 mS`. */
export interface OverrideSyntax {
  /** `gm1`, or `second` in `second.gm`. */
  readonly target: Token;
  /** `gm` in `second.gm`. */
  readonly field?: Token;
  readonly targetText: string;
  readonly targetRange: SourceRange;
  readonly expr: Expr;
  readonly text: string;
}

export interface DesignSyntax {
  readonly name: string;
  readonly keyword: Token;
  readonly nameToken?: Token;
  readonly range: SourceRange;
  readonly statements: readonly Statement[];
  /**
   * The second word of each line whose statement keyword was not recognised (`stag first …`): probably a
   * name that line meant to declare. Uses of it stay silent, since the line is already reported.
   */
  readonly tentativeNames: readonly Token[];
  /** Every word on a line with a syntax error: such a line may connect a node, so no node it names is called unconnected. */
  readonly brokenMentions: ReadonlySet<string>;
  /** False when the file ended (or another design began) before `end`. */
  readonly closed: boolean;
}

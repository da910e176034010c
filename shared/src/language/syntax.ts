// The syntax tree: one statement per line, every part with its exact range. Produced by parseStatement,
// read by the evaluator.
import type { Expr } from './expression';
import type { Token } from './lexer';
import type { SourcePosition, SourceRange } from './source';
import type { ElementKind, RequirementWord } from './vocabulary';
import type { Comparison, Polarity } from './model';

export interface FieldSyntax {
  readonly name: string;
  readonly nameToken: Token;
  readonly expr: Expr;
  /** The expression's text as written. */
  readonly text: string;
}

interface Common {
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

export type Statement = Common &
  (
    | { readonly kind: 'param'; readonly name?: Token }
    | { readonly kind: 'node'; readonly names: readonly Token[] }
    | {
        readonly kind: 'stage';
        readonly name?: Token;
        readonly from?: Token;
        readonly polarity?: PolaritySyntax;
      }
    | { readonly kind: 'load'; readonly at?: Token }
    | { readonly kind: 'miller' | 'indirect'; readonly from?: Token; readonly to?: Token }
    | {
        readonly kind: 'feedforward';
        readonly from?: Token;
        readonly to?: Token;
        readonly polarity?: PolaritySyntax;
      }
    | {
        readonly kind: 'element';
        readonly element?: ElementKind;
        readonly a?: Token;
        readonly b?: Token;
        readonly polarity?: PolaritySyntax;
      }
    | { readonly kind: 'output'; readonly node?: Token }
    | { readonly kind: 'feedback' }
    | {
        readonly kind: 'require';
        readonly requirement?: RequirementWord;
        readonly requirementToken?: Token;
        readonly op?: Comparison;
      }
    | { readonly kind: 'corner'; readonly name?: Token; readonly overrides: readonly OverrideSyntax[] }
  );

export type StatementKind = Statement['kind'];

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

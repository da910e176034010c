// What defines a kind of statement, in one place: its words, the nodes it names, the names it declares, how
// its line is read and what it adds to a model. The parser, the design's scope, the connection check,
// completion and the model builder all read these descriptors (see ./index.ts for the table of them).
import type { Reporter } from '../diagnostics';
import type { DesignScope } from '../designScope';
import type { Expr } from '../expression';
import type { Token } from '../lexer';
import type { FieldOrigin, NodeName, NodeRef, Origin, Polarity } from '../model';
import type { Built } from '../modelParts';
import type { StatementParser } from '../statementParser';
import type { StatementCommon } from '../syntax';
import type { NamedDimension } from '../unitTable';
import type { ValueRole } from '../valueRanges';
import type { Statement, StatementOf } from './index';

/** One value of a statement: a `name = value` field, or a value in a fixed place (`param x = …`). */
export interface FieldSpec {
  /** As written (`gm`), or the name a value in a fixed place is kept under (`value`, `tolerance`). */
  readonly name: string;
  /** The unit a plain number written there is taken in. */
  readonly unit: NamedDimension;
  /** Which usual range judges the value (see valueRanges.ts). */
  readonly role: ValueRole;
  /** The statement adds nothing without it. */
  readonly required?: boolean;
}

/** `attached`: an element of the statement connects to the node; `sensed`: only its voltage is read. */
export type NodeUse = 'attached' | 'sensed';

export interface NodeMention {
  readonly token: Token;
  readonly use: NodeUse;
}

export const attached = (t: Token | undefined): NodeMention[] => (t ? [{ token: t, use: 'attached' }] : []);
export const sensed = (t: Token | undefined): NodeMention[] => (t ? [{ token: t, use: 'sensed' }] : []);

/** A name a statement declares, and into which of the design's name sets it goes. */
export type NameDeclaration =
  | { readonly kind: 'param'; readonly token: Token; readonly statement: StatementOf<'param'> }
  | { readonly kind: 'stage'; readonly token: Token; readonly statement: StatementOf<'stage'> }
  | { readonly kind: 'node'; readonly token: Token; readonly statement: Statement }
  | { readonly kind: 'corner'; readonly token: Token; readonly statement: StatementOf<'corner'> };

/** A statement's own parts while its line is read: whatever was read before a syntax error is kept. */
export type Draft<S> = {
  -readonly [K in Exclude<keyof S, keyof StatementCommon | 'kind' | 'polarity'>]?: S[K];
};

export interface EvaluatedFields {
  readonly values: Readonly<Record<string, number>>;
  readonly origins: Readonly<Record<string, FieldOrigin>>;
}

export type FieldResult =
  | { readonly status: 'absent' }
  | { readonly status: 'failed' }
  | { readonly status: 'ok'; readonly value: number; readonly origin: FieldOrigin };

/** What building a statement may ask of the evaluation it is part of (the nominal one or a corner's). */
export interface BuildContext {
  readonly scope: DesignScope;
  readonly sink: Reporter;
  /** The design's output node (a load without `at` sits there); undefined when it has an error. */
  output(): NodeName | undefined;
  /** Evaluates the listed fields and reports missing required ones; undefined when any failed. */
  fields(s: Statement, specs: readonly FieldSpec[]): EvaluatedFields | undefined;
  /** Evaluates one value, checked against its unit and its usual range; `displayName` names it in messages. */
  field(s: Statement, spec: FieldSpec, displayName?: string): FieldResult;
  /**
   * Evaluates a written value of any dimension (a `minimize` expression, a free parameter's bounds),
   * reporting only its own errors; undefined when it has one.
   */
  quantity(s: Statement, name: string): { value: number; dimension: string; origin: FieldOrigin } | undefined;
  /** The expression this evaluation uses for a field: a corner's override, else the one written. */
  writtenExpr(s: Statement, name: string): Expr | undefined;
  resolveNode(t: Token): NodeRef | undefined;
  /** A node that cannot be ground; `what` starts the message when it is (`A load`). */
  resolveNodeName(t: Token, what: string): NodeName | undefined;
  origin(s: Statement, fields: Record<string, FieldOrigin>): Origin;
}

export interface StatementDescriptor<S extends Statement> {
  /** The word that starts its line; also its key in the table of kinds. */
  readonly keyword: S['kind'];
  /** Its `name = value` fields, in the order completion offers them. */
  readonly fields: readonly FieldSpec[];
  readonly flags: readonly Polarity[];
  /** Words that introduce one of its parts (`from`, `at`, `within`): a value stops before them. */
  readonly connectors: readonly string[];
  /** When the word after the keyword chooses a variant (`element res`, `require pm`): those words. */
  readonly variants?: { readonly words: readonly string[]; readonly detail: string };
  /** A corner may address its fields by the keyword (`load.cap`) when the design has one such statement. */
  readonly overriddenByKeyword: boolean;
  /** Reads the line after the keyword into `parts`; a syntax error ends it through `p.fail`. */
  parse(p: StatementParser, parts: Draft<S>): void;
  /** The nodes it refers to (not the ones it declares), in text order. */
  nodes(s: S): readonly NodeMention[];
  declares(s: S): readonly NameDeclaration[];
  /** What it adds to one model. Called only for a statement without errors of its own. */
  build(s: S, ctx: BuildContext): Built;
}

// The table of statement kinds: one descriptor per kind, in the order the language lists them. A kind
// missing from the table, or a new variant of `Statement` without a descriptor, does not compile.
import { cornerKind, type CornerStatement } from './corner';
import { elementKind, type ElementStatement } from './element';
import { feedbackKind, type FeedbackStatement } from './feedback';
import { feedforwardKind, type FeedforwardStatement } from './feedforward';
import { indirectKind, type IndirectStatement } from './indirect';
import { loadKind, type LoadStatement } from './load';
import { millerKind, type MillerStatement } from './miller';
import { minimizeKind, type MinimizeStatement } from './minimize';
import { nodeKind, type NodeStatement } from './node';
import { outputKind, type OutputStatement } from './output';
import { paramKind, type ParamStatement } from './param';
import { requireKind, type RequireStatement } from './require';
import { stageKind, type StageStatement } from './stage';
import type { StatementDescriptor } from './statementKind';
import { supplyKind, type SupplyStatement } from './supply';
import { sweepKind, type SweepStatement } from './sweep';

export type Statement =
  | ParamStatement
  | NodeStatement
  | SupplyStatement
  | StageStatement
  | LoadStatement
  | MillerStatement
  | IndirectStatement
  | FeedforwardStatement
  | ElementStatement
  | OutputStatement
  | FeedbackStatement
  | RequireStatement
  | MinimizeStatement
  | SweepStatement
  | CornerStatement;

export type StatementKind = Statement['kind'];
export type StatementOf<K extends StatementKind> = Extract<Statement, { kind: K }>;

/** Every statement kind by its keyword; the keys' order is the order the language lists them in. */
export const STATEMENT_KINDS: { readonly [K in StatementKind]: StatementDescriptor<StatementOf<K>> } = {
  param: paramKind,
  node: nodeKind,
  supply: supplyKind,
  stage: stageKind,
  load: loadKind,
  miller: millerKind,
  indirect: indirectKind,
  feedforward: feedforwardKind,
  element: elementKind,
  output: outputKind,
  feedback: feedbackKind,
  require: requireKind,
  minimize: minimizeKind,
  sweep: sweepKind,
  corner: cornerKind,
};

/** The descriptor of a statement's own kind. */
export function kindOf<S extends Statement>(s: S): StatementDescriptor<S> {
  // The table pairs each key with the descriptor of that kind; TypeScript cannot follow that pairing
  // through an index by a union, so it is asserted here, once.
  return STATEMENT_KINDS[s.kind] as unknown as StatementDescriptor<S>;
}

export { ELEMENT_KINDS, type ElementKind } from './element';
export { REQUIREMENT_KINDS, type RequirementWord } from './require';
export type * from './statementKind';

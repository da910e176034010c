// The words of the language, as tables derived from the statement kinds' descriptors (statements/): the
// parser's stop words, the names that cannot be declared, completion and the docs test all read these.
import { STATEMENT_KINDS, type StatementKind } from './statements';
import { ELEMENT_KINDS } from './statements/element';
import { REQUIREMENT_KINDS } from './statements/require';
import { DIM, type Dimension, type NamedDimension } from './unitTable';

export { ELEMENT_KINDS, type ElementKind } from './statements/element';
export { REQUIREMENT_KINDS, type RequirementWord } from './statements/require';
export { closest, editDistance } from './closestWord';

const KINDS = Object.entries(STATEMENT_KINDS) as [StatementKind, (typeof STATEMENT_KINDS)[StatementKind]][];

// Without a prototype, a table looked up by any word the user typed (`constructor`) finds nothing.
const table = <T>(entries: Iterable<readonly [string, T]>): Readonly<Record<string, T>> =>
  Object.assign(Object.create(null) as Record<string, T>, Object.fromEntries(entries));

const byKind = <T>(pick: (d: (typeof STATEMENT_KINDS)[StatementKind]) => T): Readonly<Record<string, T>> =>
  table(KINDS.map(([k, d]) => [k, pick(d)] as const));

const unique = (words: readonly string[]): string[] => [...new Set(words)];

export const STATEMENT_KEYWORDS: readonly StatementKind[] = KINDS.map(([, d]) => d.keyword);
export type StatementKeyword = StatementKind;

/** Words that introduce a part of a statement (`from NODE`, `at NODE`, `within TIME`). */
export const CONNECTORS: readonly string[] = unique(KINDS.flatMap(([, d]) => d.connectors));

/** Flags (bare words) of any statement. */
const ALL_FLAGS: readonly string[] = unique(KINDS.flatMap(([, d]) => d.flags));

/** Words that are not statements: block delimiters, connectors and flags. */
export const OTHER_KEYWORDS: readonly string[] = ['design', 'end', ...CONNECTORS, ...ALL_FLAGS];

export const BUILTIN_NODES = ['in', 'gnd', 'out'] as const;

/** Every keyword of the language (for completion and the editor grammar). */
export const KEYWORDS: readonly string[] = [
  'design',
  'end',
  ...STATEMENT_KEYWORDS,
  ...ELEMENT_KINDS,
  ...REQUIREMENT_KINDS,
  ...CONNECTORS,
  ...ALL_FLAGS,
];

/** The `name = value` fields each statement accepts. */
export const FIELDS_BY_STATEMENT: Readonly<Record<string, readonly string[]>> = byKind((d) =>
  d.fields.map((f) => f.name),
);

/** Fields that must be written (the others are optional). */
export const REQUIRED_FIELDS: Readonly<Record<string, readonly string[]>> = byKind((d) =>
  d.fields.filter((f) => f.required).map((f) => f.name),
);

/** Flags (bare words) each statement accepts. */
export const FLAGS_BY_STATEMENT: Readonly<Record<string, readonly string[]>> = byKind((d) => d.flags);

/** The words that may follow each keyword and choose its variant (`element res`, `require pm`). */
export const VARIANTS_BY_STATEMENT: Readonly<
  Record<string, { readonly words: readonly string[]; readonly detail: string }>
> = table(KINDS.flatMap(([k, d]) => (d.variants ? [[k, d.variants] as const] : [])));

/** The unit a field implies: a plain number written there is taken in this unit. */
// A field name means one quantity in every statement that has it (a test holds the kinds to that).
export const FIELD_DIMENSIONS: Readonly<Record<string, NamedDimension>> = table(
  KINDS.flatMap(([, d]) => d.fields.map((f) => [f.name, f.unit] as const)),
);

/** Statements whose fields a corner addresses by the keyword (`load.cap`), in the language's order. */
export const OVERRIDDEN_BY_KEYWORD: readonly StatementKind[] = KINDS.filter(
  ([, d]) => d.overriddenByKeyword,
).map(([k]) => k);

export const dimensionOf = (name: NamedDimension): Dimension => DIM[name];

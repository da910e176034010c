// The words and operators both fuzzers draw from, read from the language's own tables: a new statement,
// field, variant, connector or function is fuzzed as soon as the language has it.
import {
  BUILTIN_NODES,
  FIELDS_BY_STATEMENT,
  FUNCTION_NAMES,
  KEYWORDS,
  VARIANTS_BY_STATEMENT,
} from '../shared/src/language';

export const LANGUAGE_WORDS: readonly string[] = [
  ...new Set([
    ...KEYWORDS,
    ...Object.values(FIELDS_BY_STATEMENT).flat(),
    ...Object.values(VARIANTS_BY_STATEMENT).flatMap((v) => v.words),
    ...BUILTIN_NODES,
    ...FUNCTION_NAMES,
  ]),
];

export const OPERATORS: readonly string[] = [
  '=',
  '->',
  '>=',
  '<=',
  ',',
  '.',
  '..',
  '+',
  '-',
  '*',
  '/',
  '^',
  '(',
  ')',
  '%',
  '#',
  '||',
  '∥',
  '≥',
  '≤',
];

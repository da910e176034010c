// The words of the language: statement keywords, the fields each statement takes and the unit each field
// implies. The parser, the docs and the editor's completion all read these tables.
import { DIM, type Dimension, type NamedDimension } from './unitTable';

export const STATEMENT_KEYWORDS = [
  'param',
  'node',
  'stage',
  'load',
  'miller',
  'indirect',
  'feedforward',
  'element',
  'output',
  'feedback',
  'require',
  'corner',
] as const;
export type StatementKeyword = (typeof STATEMENT_KEYWORDS)[number];

export const ELEMENT_KINDS = ['res', 'cap', 'gm'] as const;
export type ElementKind = (typeof ELEMENT_KINDS)[number];

export const REQUIREMENT_KINDS = ['ugf', 'pm', 'gainmargin', 'zero', 'slew', 'settle', 'dcgain'] as const;
export type RequirementWord = (typeof REQUIREMENT_KINDS)[number];

/** Words that are not statements: block delimiters, connectors and flags. */
export const OTHER_KEYWORDS = ['design', 'end', 'from', 'at', 'inverting', 'noninverting', 'within'] as const;

export const BUILTIN_NODES = ['in', 'gnd', 'out'] as const;

/** Every keyword of the language (for completion and the editor grammar). */
export const KEYWORDS: readonly string[] = [
  'design',
  'end',
  ...STATEMENT_KEYWORDS,
  ...ELEMENT_KINDS,
  ...REQUIREMENT_KINDS,
  'from',
  'at',
  'inverting',
  'noninverting',
  'within',
];

/** The `name = value` fields each statement accepts. */
export const FIELDS_BY_STATEMENT: Readonly<Record<string, readonly string[]>> = {
  param: [],
  stage: ['gm', 'rout', 'cap', 'bias'],
  load: ['cap', 'res'],
  miller: ['cc', 'rz'],
  indirect: ['cc', 'gm', 'cap'],
  feedforward: ['gm'],
  feedback: ['beta'],
  element: [],
};

/** Fields that must be written (the others are optional; see `FIELD_DEFAULTS`). */
export const REQUIRED_FIELDS: Readonly<Record<string, readonly string[]>> = {
  stage: ['gm', 'rout'],
  miller: ['cc'],
  indirect: ['cc', 'gm'],
  feedforward: ['gm'],
  feedback: ['beta'],
};

/** Flags (bare words) each statement accepts. */
export const FLAGS_BY_STATEMENT: Readonly<Record<string, readonly string[]>> = {
  stage: ['inverting', 'noninverting'],
  feedforward: ['inverting', 'noninverting'],
  element: ['inverting', 'noninverting'],
};

/** The unit a field implies: a plain number written there is taken in this unit. */
export const FIELD_DIMENSIONS: Readonly<Record<string, NamedDimension>> = {
  gm: 'S',
  rout: 'ohm',
  rz: 'ohm',
  res: 'ohm',
  cap: 'F',
  cc: 'F',
  bias: 'A',
  beta: 'one',
};

export const ELEMENT_DIMENSIONS: Readonly<Record<ElementKind, NamedDimension>> = {
  res: 'ohm',
  cap: 'F',
  gm: 'S',
};

export const REQUIREMENT_DIMENSIONS: Readonly<Record<RequirementWord, NamedDimension>> = {
  ugf: 'Hz',
  pm: 'deg',
  gainmargin: 'dB',
  zero: 'ugf',
  slew: 'V/s',
  settle: 'one',
  dcgain: 'dB',
};

export const dimensionOf = (name: NamedDimension): Dimension => DIM[name];

/** Lowercase edit distance, for "did you mean" hints. */
export function editDistance(a: string, b: string): number {
  a = a.toLowerCase();
  b = b.toLowerCase();
  const row = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    let prev = row[0]!;
    row[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const cur = row[j]!;
      row[j] = Math.min(row[j]! + 1, row[j - 1]! + 1, prev + (a[i - 1] === b[j - 1] ? 0 : 1));
      prev = cur;
    }
  }
  return row[b.length]!;
}

/** The closest candidate within a small edit distance, if any. */
export function closest(word: string, candidates: Iterable<string>): string | undefined {
  let best: string | undefined;
  let bestD = Infinity;
  const limit = word.length <= 3 ? 1 : 2;
  for (const c of candidates) {
    // Lengths further apart than the limit cannot be near; skipping them keeps a huge word cheap.
    if (Math.abs(c.length - word.length) > limit) continue;
    const d = editDistance(word, c);
    if (d < bestD) [best, bestD] = [c, d];
  }
  return bestD <= limit ? best : undefined;
}

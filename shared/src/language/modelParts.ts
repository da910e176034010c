// The lists of a model that statements add to. One table of their names, so that collecting, counting and
// taking over a statement's contribution never lists them by hand.
import type {
  BufferedCap,
  Element,
  Feedback,
  Load,
  Miller,
  Objective,
  Origin,
  Requirement,
  Stage,
  SupplyNode,
  Sweep,
} from './model';

/** What a `feedback` statement gives the model (a factor, or the node the loop closes at); the model takes the first. */
export type FeedbackPart = Feedback & { readonly origin: Origin };

export interface ModelParts {
  readonly stages: readonly Stage[];
  readonly loads: readonly Load[];
  readonly millers: readonly Miller[];
  readonly buffered: readonly BufferedCap[];
  readonly elements: readonly Element[];
  readonly requirements: readonly Requirement[];
  readonly feedback: readonly FeedbackPart[];
  /** What a `minimize` statement gives the model; the model takes the first. */
  readonly objective: readonly Objective[];
  readonly sweeps: readonly Sweep[];
  readonly supplies: readonly SupplyNode[];
}

/** What one statement adds: some of the lists, usually one item in one. */
export type Built = Partial<ModelParts>;

export const NOTHING: Built = {};

// `satisfies` fails to compile when a list is added to ModelParts but not here.
const PART_NAMES = Object.keys({
  stages: true,
  loads: true,
  millers: true,
  buffered: true,
  elements: true,
  requirements: true,
  feedback: true,
  objective: true,
  sweeps: true,
  supplies: true,
} satisfies Record<keyof ModelParts, true>) as (keyof ModelParts)[];

/** A model's lists while statements add to them. */
export type PartLists = { -readonly [K in keyof ModelParts]: ModelParts[K][number][] };

/** Empty lists to collect a model's parts into. */
export function emptyParts(): PartLists {
  const out = {} as Record<keyof ModelParts, unknown[]>;
  for (const k of PART_NAMES) out[k] = [];
  return out as PartLists;
}

/** Appends what a statement built, list by list, in statement order. */
export function appendParts(into: PartLists, built: Built): void {
  for (const k of PART_NAMES) {
    const items = built[k];
    if (items) (into[k] as unknown[]).push(...items);
  }
}

/** How many items a statement built, over all lists. */
export function countParts(built: Built): number {
  let n = 0;
  for (const k of PART_NAMES) n += built[k]?.length ?? 0;
  return n;
}

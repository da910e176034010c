// Findings: what the checks report, located in the text, with fixes solved on the exact model.
import type { SourceRange } from '../language/source';

/** Stable codes: reviewers' tools and the docs rely on them. Never rename one. */
export const CHECK_CODES = [
  'stability',
  'phase-margin',
  'gain-margin',
  'rhp-zero',
  'gm-ratio',
  'nondominant-pole',
  'second-stage-bandwidth',
  'complex-poles',
  'doublet',
  'slew-rate',
  'settling',
  'approximation',
  'plausibility',
  'ugf',
  'dc-gain',
  'closed-loop-gain',
  'output-impedance',
  'supply-rejection',
  'load-step',
  'sweep',
  'syntax',
  'unit',
  'reference',
] as const;
export type CheckCode = (typeof CHECK_CODES)[number];

export type Severity = 'error' | 'warning' | 'info';

export interface TextEditSpec {
  readonly range: SourceRange;
  readonly newText: string;
}

/** A quick fix: an ordinary edit of the text, already solved and re-checked on the exact model. */
export interface FixSuggestion {
  readonly title: string;
  readonly edits: readonly TextEditSpec[];
  /** True for the fix the tool recommends first. */
  readonly preferred?: boolean;
  /**
   * Set when no value of this kind meets the rule: why, in words (the edits are then empty). The editor
   * shows it as a disabled action, so the designer learns why no fix is offered.
   */
  readonly disabled?: string;
}

export interface Finding {
  readonly code: CheckCode;
  readonly severity: Severity;
  readonly message: string;
  /** The design the finding belongs to (absent for file-level syntax errors outside any design). */
  readonly design?: string;
  /** Where the finding is shown: on the element to change. */
  readonly range: SourceRange;
  readonly related: readonly { readonly range: SourceRange; readonly message: string }[];
  /** Set when the finding holds only in some corners: their names (`nominal` for the nominal model). */
  readonly corners?: readonly string[];
  readonly fixes: readonly FixSuggestion[];
}

// Custom LSP requests and notifications between client and server: method name beside its types.
import type { CompensationTarget, PanelData } from './panelData';

export const PanelDataRequest = {
  method: 'ampnote/panelData',
} as const;
export interface PanelDataParams {
  readonly uri: string;
  /** Design name; when absent, the design containing `position`, else the first design. */
  readonly design?: string;
  readonly position?: { readonly line: number; readonly character: number };
  /** Values from the panel's sliders, overriding the compensation as written (F, ohm). */
  readonly cc?: number;
  readonly rz?: number;
  /** The element the sweep and sliders vary; when absent (or not in the design) the first Miller, else
   * the first buffered capacitor. */
  readonly compensation?: CompensationTarget;
  /** The element whose statement holds this position, when there is one, takes precedence over
   * `compensation` (the panel opened with the cursor on a `miller` line). */
  readonly compensationAt?: { readonly line: number; readonly character: number };
  /** Values for the design's free parameters, by name (SI); the text is edited and analysed again. */
  readonly free?: Readonly<Record<string, number>>;
}
export type PanelDataResult = PanelData | null;

/** The status bar's summary of the design under the cursor. */
export const DesignSummaryRequest = {
  method: 'ampnote/designSummary',
} as const;
export interface DesignSummaryParams {
  readonly uri: string;
  readonly position: { readonly line: number; readonly character: number };
}
export type DesignSummaryResult = {
  readonly design: string;
  readonly ugfHz?: number;
  readonly phaseMarginDeg?: number;
  readonly worstCorner?: string;
} | null;

/** The edit that writes a value chosen in the panel into the file (an ordinary, undoable edit). */
export const CompensationEditRequest = {
  method: 'ampnote/compensationEdit',
} as const;
export interface CompensationEditParams {
  readonly uri: string;
  readonly design: string;
  readonly cc?: number;
  readonly rz?: number;
  /** The element to write into; when absent the first Miller, else the first buffered capacitor. */
  readonly compensation?: CompensationTarget;
}
export type CompensationEditResult = {
  readonly edits: readonly {
    readonly range: { start: { line: number; character: number }; end: { line: number; character: number } };
    readonly newText: string;
  }[];
  /** Set (with no edits) when the values cannot be written: why, in words for the user. */
  readonly refused?: string;
} | null;

/** Solve a design's free parameters: the edit of their values that meets every requirement (undoable). */
export const SolveDesignRequest = {
  method: 'ampnote/solveDesign',
} as const;
export interface SolveDesignParams {
  readonly uri: string;
  readonly design: string;
}
export type SolveDesignResult = {
  readonly status: 'met' | 'infeasible' | 'no-free-parameters';
  /** One paragraph for the user: values before → after, the objective, what binds or conflicts. */
  readonly summary: string;
  /** The edits of the free parameters' values; empty unless `met`. */
  readonly edits: readonly {
    readonly range: { start: { line: number; character: number }; end: { line: number; character: number } };
    readonly newText: string;
  }[];
  /** The values found (the best compromise when infeasible), by parameter name (SI). */
  readonly values?: readonly { readonly name: string; readonly value: number }[];
} | null;

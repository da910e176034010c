// Messages between the extension host and the panel's webview, typed once for both sides.
import type { ChartId } from '../charts/descriptors';
import type { CompensationTarget, PanelData } from './panelData';

export type HostToWebview =
  | { readonly type: 'data'; readonly data: PanelData | null }
  | { readonly type: 'theme' }
  | { readonly type: 'restore'; readonly state: PanelState }
  /** A line for the panel's status area (busy, an error from the server); empty clears it. */
  | { readonly type: 'status'; readonly text: string; readonly error?: boolean };

export type WebviewToHost =
  | { readonly type: 'ready' }
  | { readonly type: 'slider'; readonly cc?: number; readonly rz?: number }
  | { readonly type: 'apply'; readonly cc?: number; readonly rz?: number }
  /** The free parameters' sliders moved: every value shown, by parameter name (SI). */
  | { readonly type: 'free'; readonly values: Readonly<Record<string, number>> }
  /** Solve the shown design's free parameters and move the sliders to the answer. */
  | { readonly type: 'solve' }
  /** Write these free values into the file (one undoable edit). */
  | { readonly type: 'applyFree'; readonly values: Readonly<Record<string, number>> }
  /** The selector chose another element to sweep (slider values of the previous one are dropped). */
  | { readonly type: 'compensation'; readonly target: CompensationTarget }
  | { readonly type: 'exportCsv'; readonly chart: ChartId; readonly csv: string }
  | { readonly type: 'exportPng'; readonly chart: ChartId; readonly dataUrl: string };

/** What the webview keeps across hide/show (vscode.setState). */
export interface PanelState {
  readonly selected: ChartId;
  readonly cc?: number;
  readonly rz?: number;
  /** Free parameters' slider values, by name (SI), for the design shown. */
  readonly free?: Readonly<Record<string, number>>;
  /** The step chart is zoomed to its settling band. */
  readonly stepBandZoom?: boolean;
  /** Which of the design's sweeps the sweep charts show (index in the order written). */
  readonly sweep?: number;
  /** The compensation element the panel sweeps (absent: the design's first). */
  readonly compensation?: CompensationTarget;
  /** The document and design shown, so that a panel restored after a reload shows them again. */
  readonly uri?: string;
  readonly design?: string;
}

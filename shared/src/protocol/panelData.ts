// The panel's data, computed by the engine in the server and drawn by the webview. Plain JSON only.
import type { CompensationElement } from '../analysis/compensation';
import type { Complex, Crossing, Participation } from '../analysis/types';

export const CAUTION =
  'Small-signal, linear estimates at one operating point. They guide compensation choices; they do not ' +
  'replace transistor-level simulation across process, voltage and temperature, nor your sign-off practice.';

export interface PanelPole {
  readonly s: Complex;
  readonly hz: number;
  readonly damping: number;
  readonly namedAfter: string;
  readonly participation: readonly Participation[];
}

export interface PanelZero {
  readonly s: Complex;
  readonly hz: number;
  readonly rhp: boolean;
}

/** One branch of the pole-split locus: magnitudes (Hz) of the k-th pole (sorted by magnitude) against Cc. */
export interface LocusSeries {
  readonly label: string;
  /** Farads; the first point is Cc = 0 (uncompensated), drawn at the axis' left edge. */
  readonly cc: readonly number[];
  readonly hz: readonly number[];
  /** For zero branches: whether each point lies in the right half-plane. */
  readonly rhp?: readonly boolean[];
}

/** A slider's span (SI units); the panel moves it on a logarithmic scale. */
export interface SliderRange {
  readonly min: number;
  readonly max: number;
}

/** One compensation element of a design, as the panel's selector lists it (the core's one definition). */
export type CompensationTarget = CompensationElement;

export interface CompensationChoice extends CompensationTarget {
  /** The element as the designer knows it, e.g. `miller second -> third`. */
  readonly label: string;
}

/** A slider for one free parameter: its bounds and scale, the value as written and the value shown (SI). */
export interface FreeSlider {
  readonly name: string;
  /** The SI unit of the parameter's dimension (`F`, `A`, `ohm`; `1` or empty for a plain number). */
  readonly unit: string;
  readonly low: number;
  readonly high: number;
  /** Logarithmic when both bounds are positive (component values span decades), else linear. */
  readonly log: boolean;
  readonly written: number;
  readonly value: number;
}

/** A requirement judged in every run at the values shown: its worst value and the corner that sets it. */
export interface FreeRequirement {
  readonly label: string;
  readonly required: string;
  readonly worst: { readonly text: string; readonly corner: string };
  readonly met: boolean;
}

/** An edit of the document (line and character positions), as the solve writes free values. */
export interface PanelEdit {
  readonly range: {
    readonly start: { readonly line: number; readonly character: number };
    readonly end: { readonly line: number; readonly character: number };
  };
  readonly newText: string;
}

/** The free parameters of a design at the values the sliders ask for, evaluated on the edited text. */
export interface FreePanel {
  readonly sliders: readonly FreeSlider[];
  readonly requirements: readonly FreeRequirement[];
  readonly objective: { readonly expression: string; readonly unit: string; readonly value: number };
  /** The edits that write the values shown (only the free parameters' literals). */
  readonly edits: readonly PanelEdit[];
  /** Why the values asked for were refused (the written values are shown instead). */
  readonly refused?: string;
}

/** The loop figures a sweep chart draws, per corner, one entry per swept value (null: not computed there). */
export type SweepQuantity = 'phaseMarginDeg' | 'ugfHz' | 'gainMarginDb';

export interface PanelSweepCorner {
  readonly corner: string;
  readonly phaseMarginDeg: readonly (number | null)[];
  readonly ugfHz: readonly (number | null)[];
  readonly gainMarginDb: readonly (number | null)[];
}

/** A requirement drawn as a line on the margins chart. */
export interface PanelSweepRequirement {
  readonly quantity: SweepQuantity;
  readonly op: '>=' | '<=';
  readonly value: number;
  /** As people read it: `PM ≥ 50°`. */
  readonly label: string;
}

/** A stretch of the swept range where a requirement fails in some corner (both ends in SI). */
export interface PanelSweepFailure {
  readonly from: number;
  readonly to: number;
  /** Which requirement: `PM ≥ 50°`, or `unstable`. */
  readonly label: string;
}

/** One root followed along the sweep (nominal corner): its values of the parameter and where it is. */
export interface PanelLocusTrack {
  readonly kind: 'pole' | 'zero';
  readonly values: readonly number[];
  readonly s: readonly Complex[];
}

/** One `sweep` of the design, analysed exactly at each value (the design as written, not the sliders). */
export interface PanelSweep {
  readonly param: string;
  /** The SI unit the parameter's values are written in (`F`, `A`, empty for a plain number). */
  readonly unit: string;
  readonly scale: 'log' | 'linear';
  readonly values: readonly number[];
  /** `nominal` first, then each corner that evaluates. */
  readonly corners: readonly PanelSweepCorner[];
  readonly requirements: readonly PanelSweepRequirement[];
  readonly failing: readonly PanelSweepFailure[];
  /** The lowest phase margin over corners and range, found between samples too. */
  readonly worstPhaseMargin?: { readonly value: number; readonly at: number; readonly corner: string };
  readonly locus: readonly PanelLocusTrack[];
}

/**
 * The large-signal step, scaled per volt of its input step so that it lies over the small-signal unit step
 * (the two coincide while no stage's current is limited).
 */
export interface PanelLargeSignalStep {
  /** The input step as stated, volts. */
  readonly amplitude: number;
  readonly t: readonly number[];
  /** Output per volt of input step. */
  readonly y: readonly number[];
  readonly final: number;
  readonly settlingTime?: number;
  readonly smallSignalSettlingTime?: number;
  /** Where some stage delivers more than 90 % of its bias (seconds). */
  readonly slewing: readonly { readonly start: number; readonly end: number }[];
  readonly slewRateReached: number;
  readonly limitingStage?: string;
}

/** A loop closed by the design's own elements: its output impedance, load step and supply rejection. */
export interface PanelClosedCircuit {
  readonly hz: readonly number[];
  /** |Zout| at `hz`, ohms. */
  readonly zoutOhm: readonly number[];
  /** The output's deviation per ampere of load step (V/A); absent when not computed. */
  readonly loadStep?: {
    readonly t: readonly number[];
    readonly y: readonly number[];
    readonly final: number;
  };
  /** Per `supply`, in text order: −20·log10|v(out)/v(supply)| at `hz`, dB. */
  readonly supplies: readonly { readonly node: string; readonly rejectionDb: readonly number[] }[];
}

export interface PanelData {
  readonly uri: string;
  readonly design: string;
  /** The Miller (or buffered) capacitor the sweep varies, and its value as written (F). */
  readonly compensation?: {
    readonly kind: 'miller' | 'buffered';
    readonly index: number;
    readonly ccWritten: number;
    readonly rzWritten?: number;
    /** The element as the designer knows it, e.g. `miller first -> second`. */
    readonly label?: string;
  };
  /** Every element the sweep can vary (Miller capacitors first, then buffered ones), in the order written. */
  readonly compensationChoices?: readonly CompensationChoice[];
  /** The values the charts show (the slider's, when one is moved; else as written). */
  readonly cc?: number;
  readonly rz?: number;
  /** Spans for the Cc and Rz sliders around the written values; absent without compensation. */
  readonly sliders?: { readonly cc: SliderRange; readonly rz: SliderRange };
  /** Present when the design has free parameters: their sliders replace the Cc and Rz sliders. */
  readonly free?: FreePanel;
  readonly poles: readonly PanelPole[];
  readonly zeros: readonly PanelZero[];
  /** Poles of the closed loop (rad/s): where stability is decided; `poles` above are the open loop's. */
  readonly closedLoopPoles?: readonly Complex[];
  readonly locus: {
    readonly poles: readonly LocusSeries[];
    readonly zeros: readonly LocusSeries[];
  };
  readonly bode: {
    readonly hz: readonly number[];
    readonly magDb: readonly number[];
    readonly phaseDeg: readonly number[];
    readonly ugfHz?: number;
    readonly phaseMarginDeg?: number;
    readonly crossings: readonly Crossing[];
  };
  readonly step: {
    readonly t: readonly number[];
    readonly y: readonly number[];
    readonly final: number;
    readonly tolerance: number;
    readonly settlingTime?: number;
    readonly overshootPct: number;
    /** False when a closed-loop pole lies in the right half-plane: the response grows, no band applies. */
    readonly stable?: boolean;
    /** Why there is no step response (the arrays are then empty), in words for the designer. */
    readonly unavailable?: string;
    /** The same loop's response to the step its `settle` requirement states, each stage's current limited. */
    readonly largeSignal?: PanelLargeSignalStep;
  };
  /** For a loop closed by its own elements (`feedback at`): the whole circuit's responses. */
  readonly closedCircuit?: PanelClosedCircuit;
  readonly summary: {
    /** The closed loop's verdict from its own poles, in words (`stable`, `UNSTABLE`, …). */
    readonly closedLoop: string;
    readonly ugfHz?: number;
    readonly phaseMarginDeg?: number;
    readonly gainMarginDb?: number;
    readonly dcGainDb: number;
    /** The DC gain as people read it, including the exact states ±∞ dB stands for (no DC path, integrator). */
    readonly dcGainText?: string;
    readonly slewVperUs?: number;
  };
  /** The design's sweeps, in the order written; absent when it has none. */
  readonly sweeps?: readonly PanelSweep[];
  /** Modelling problems that stopped the analysis (then the charts are empty). */
  readonly problems: readonly string[];
  readonly caution: string;
}

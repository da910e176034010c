// The typed design model: what the evaluator produces from a design's text, and all that the circuit and
// analysis layers read. Values are plain SI numbers with their unit in the type; every item keeps an
// `origin` so that checks can point at the text and quick fixes can edit exactly one value.
import type {
  Amperes,
  Decibels,
  Degrees,
  Farads,
  Hertz,
  Ohms,
  Ratio,
  Seconds,
  Siemens,
  Volts,
  VoltsPerSecond,
} from '../units';
import type { LanguageDiagnostic, SourcePosition, SourceRange } from './source';

declare const nodeBrand: unique symbol;
/** The name of a declared, non-ground node of one design. Only the evaluator creates these. */
export type NodeName = string & { readonly [nodeBrand]: true };

/** A terminal of an element: ground, or a node that the evaluator has checked is declared. */
export type NodeRef = { readonly kind: 'ground' } | { readonly kind: 'node'; readonly name: NodeName };

/** Where a value came from in the text. */
export interface FieldOrigin {
  /** The range of the value's expression (e.g. `1.1 pF` or `2 * gm1`). A quick fix replaces this range. */
  readonly range: SourceRange;
  /** The expression as written. */
  readonly text: string;
  /** Set when the expression is exactly one parameter reference: a fix edits that parameter instead. */
  readonly param?: string;
}

/** Where a statement came from. `fields` is keyed by the statement's field name (`cc`, `rz`, `gm`, …). */
export interface Origin {
  readonly range: SourceRange;
  /** The range of the statement's keyword (e.g. `miller`), where findings about the whole statement go. */
  readonly keywordRange: SourceRange;
  /** The end of the statement's last token before any comment: where a fix inserts a missing field. */
  readonly insertAt: SourcePosition;
  readonly fields: Readonly<Record<string, FieldOrigin>>;
}

export type Polarity = 'noninverting' | 'inverting';

export interface NodeDecl {
  readonly name: NodeName;
  /** `input`/`output`: the built-in `in` and `out`; `stage`: the output node of a stage; `declared`: `node x`. */
  readonly kind: 'input' | 'output' | 'stage' | 'declared';
  /** Where the node is introduced (absent for built-ins that the text never mentions). */
  readonly range?: SourceRange;
}

/**
 * A gain stage: a transconductance from `input` into its own output node `name`, with that node's
 * resistance and capacitance to ground. Non-inverting injects gm·v(input) into the node (DC gain
 * +gm·rout); inverting draws it out (DC gain −gm·rout).
 */
export interface Stage {
  readonly name: NodeName;
  readonly input: NodeRef;
  /** `from P, N`: the stage senses v(input) − v(inputN). Absent for a single-ended input (N is ground). */
  readonly inputN?: NodeRef;
  readonly gm: Siemens;
  readonly rout: Ohms;
  readonly cap: Farads;
  readonly polarity: Polarity;
  /** The current available to slew this stage's output node (tail current, or quiescent current). */
  readonly bias?: Amperes;
  readonly origin: Origin;
}

/** The load at a node (the design's output unless written otherwise). */
export interface Load {
  readonly node: NodeName;
  readonly cap?: Farads;
  readonly res?: Ohms;
  readonly origin: Origin;
}

/** A Miller capacitor between two nodes, with an optional series (nulling) resistor. */
export interface Miller {
  readonly from: NodeName;
  readonly to: NodeName;
  readonly cc: Farads;
  readonly rz?: Ohms;
  readonly origin: Origin;
}

/**
 * Indirect compensation: a capacitor from `from` (usually the output) into the low-impedance input of a
 * current buffer whose output current feeds `to`. The buffer is a common-gate device of transconductance
 * `gm`; `cap` is the capacitance at its input node. The circuit layer creates that internal node.
 */
export interface BufferedCap {
  readonly from: NodeName;
  readonly to: NodeName;
  readonly cc: Farads;
  readonly gm: Siemens;
  readonly cap?: Farads;
  readonly origin: Origin;
}

/** Any extra linear element between named nodes. */
export type Element =
  | {
      readonly kind: 'res';
      readonly a: NodeRef;
      readonly b: NodeRef;
      readonly value: Ohms;
      readonly origin: Origin;
    }
  | {
      readonly kind: 'cap';
      readonly a: NodeRef;
      readonly b: NodeRef;
      readonly value: Farads;
      readonly origin: Origin;
    }
  | {
      /** A voltage-controlled current: gm·v(control) injected into `output` (drawn out when inverting). */
      readonly kind: 'gm';
      readonly control: NodeRef;
      /** `element gm P, N -> OUT`: the control is v(control) − v(controlN); absent when N is ground. */
      readonly controlN?: NodeRef;
      readonly output: NodeRef;
      readonly value: Siemens;
      readonly polarity: Polarity;
      readonly origin: Origin;
    };

export type Comparison = '>=' | '<=';

export type Requirement =
  | { readonly kind: 'ugf'; readonly op: Comparison; readonly value: Hertz; readonly origin: Origin }
  | { readonly kind: 'pm'; readonly op: Comparison; readonly value: Degrees; readonly origin: Origin }
  | {
      readonly kind: 'gain-margin';
      readonly op: Comparison;
      readonly value: Decibels;
      readonly origin: Origin;
    }
  /** Every right-half-plane zero at or above `factor` times the loop's unity-gain frequency. */
  | { readonly kind: 'zero'; readonly op: '>='; readonly factor: Ratio; readonly origin: Origin }
  | {
      readonly kind: 'slew';
      readonly op: Comparison;
      readonly value: VoltsPerSecond;
      readonly origin: Origin;
    }
  /**
   * Closed-loop step settles into ±tolerance (a fraction, 0.001 for 0.1 %) of its final value within
   * `within`. With `step`, for an input step of that size with the stages' currents limited by their bias
   * (large-signal); without, for the small-signal response.
   */
  | {
      readonly kind: 'settle';
      readonly tolerance: Ratio;
      readonly within: Seconds;
      readonly step?: Volts;
      readonly origin: Origin;
    }
  | { readonly kind: 'dc-gain'; readonly op: Comparison; readonly value: Decibels; readonly origin: Origin }
  /** Closed-loop output impedance at most `value`: at `atHz`, or its peak over frequency without it. */
  | {
      readonly kind: 'output-impedance';
      readonly op: '<=';
      readonly value: Ohms;
      readonly atHz?: Hertz;
      readonly origin: Origin;
    }
  /** Rejection −20·log10|v(out)/v(supply)| at `atHz` at least `value`, for `supply` or every supply. */
  | {
      readonly kind: 'supply-rejection';
      readonly op: '>=';
      readonly value: Decibels;
      readonly atHz: Hertz;
      readonly supply?: NodeName;
      readonly origin: Origin;
    }
  /** The output's largest deviation for a load-current step of `step` amperes at most `value`. */
  | {
      readonly kind: 'load-step';
      readonly op: '<=';
      readonly value: Volts;
      readonly step: Amperes;
      readonly origin: Origin;
    }
  /** The closed loop's DC gain from `in` to the output, in dB. */
  | {
      readonly kind: 'closed-loop-gain';
      readonly op: Comparison;
      readonly value: Decibels;
      readonly origin: Origin;
    };

export type RequirementKind = Requirement['kind'];

export interface Param {
  readonly name: string;
  /** The evaluated value in SI, with the dimension the evaluator inferred. */
  readonly value: number;
  readonly dimension: string;
  readonly origin: Origin;
  /** Set by `free LOW .. HIGH`: the range (SI, same dimension) within which the solve may move the value. */
  readonly free?: FreeRange;
}

export interface FreeRange {
  readonly low: number;
  readonly high: number;
  /** The `free LOW .. HIGH` clause in the text. */
  readonly range: SourceRange;
}

/** `minimize EXPR`: what the solve makes small, evaluated in this model. */
export interface Objective {
  readonly value: number;
  /** The expression as written. */
  readonly text: string;
  readonly origin: Origin;
}

export type SweepScale = 'log' | 'linear';

/** `sweep NAME from LOW to HIGH`: a parameter varied over a range (SI, the parameter's dimension). */
export interface Sweep {
  readonly param: string;
  /** The parameter's dimension as the evaluator names it (`F`, `A`, `1`). */
  readonly dimension: string;
  readonly low: number;
  readonly high: number;
  readonly points: number;
  readonly scale: SweepScale;
  readonly origin: Origin;
}

/**
 * How a design's loop is closed. `factor`: `feedback beta = …`, the loop gain β·σ·A (β = 1, a unity-gain
 * follower, when no `feedback` is written; `origin` is then absent). `node`: `feedback at NODE`, the loop
 * closed by the design's own elements, NODE the node the amplifier senses (docs/analysis.md, The loop of a
 * circuit).
 */
export type Feedback =
  | { readonly kind: 'factor'; readonly beta: Ratio; readonly origin?: Origin }
  | { readonly kind: 'node'; readonly node: NodeName; readonly origin: Origin };

/** A loop closed by the circuit at a node. */
export type FeedbackNode = Extract<Feedback, { kind: 'node' }>;

/** The node a design's loop is closed at, when it is closed by the circuit. */
export const feedbackNode = (m: { readonly feedback: Feedback }): FeedbackNode | undefined =>
  m.feedback.kind === 'node' ? m.feedback : undefined;

export interface SupplyNode {
  readonly node: NodeName;
  readonly origin: Origin;
}

/** One evaluated variant of a design: the nominal one, or a corner with its overrides applied. */
export interface DesignModel {
  readonly name: string;
  /** `undefined` for the nominal model. */
  readonly corner?: string;
  readonly nodes: readonly NodeDecl[];
  readonly input: NodeName;
  readonly output: NodeName;
  readonly stages: readonly Stage[];
  readonly loads: readonly Load[];
  readonly millers: readonly Miller[];
  readonly buffered: readonly BufferedCap[];
  readonly elements: readonly Element[];
  /** How the loop is closed: by a factor, or by the design's own elements at a node. */
  readonly feedback: Feedback;
  /** `supply NODE`: nodes held by ideal small-signal voltage sources (AC ground but in supply rejection). */
  readonly supplies?: readonly SupplyNode[];
  readonly requirements: readonly Requirement[];
  readonly params: readonly Param[];
  /** The design's `minimize` statement, when written (see solve/objective.ts for the default). */
  readonly minimize?: Objective;
  /** The design's `sweep` statements, in text order (hand-built models may leave it out). */
  readonly sweeps?: readonly Sweep[];
}

/** A name a design declares, with every place it is used: for hover, go to definition and rename. */
export interface SymbolInfo {
  readonly name: string;
  readonly kind: 'design' | 'param' | 'stage' | 'node' | 'corner';
  readonly declaration: SourceRange;
  readonly references: readonly SourceRange[];
}

export interface CornerSource {
  readonly name: string;
  readonly origin: Origin;
  /** The corner's evaluated model; absent when its overrides could not be evaluated (see diagnostics). */
  readonly model?: DesignModel;
}

/** A design as written: its extent in the text, its nominal model, its corners and its names. */
export interface DesignSource {
  readonly name: string;
  readonly range: SourceRange;
  readonly nameRange: SourceRange;
  /** The exact text of the design block: the server re-analyses a design only when this changes. */
  readonly text: string;
  /** Absent only when the design is too broken to evaluate (e.g. no input can be found). */
  readonly nominal?: DesignModel;
  readonly corners: readonly CornerSource[];
  readonly symbols: readonly SymbolInfo[];
}

export interface ParsedDocument {
  readonly designs: readonly DesignSource[];
  readonly diagnostics: readonly LanguageDiagnostic[];
}

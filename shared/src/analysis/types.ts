// Results of the exact small-signal analysis. Everything is SI (rad/s for roots, Hz where named `…Hz`).
import type { NodeName } from '../language/model';

export interface Complex {
  readonly re: number;
  readonly im: number;
}

/** A node's share of one pole, from the right and left eigenvectors of the nodal pencil. */
export interface Participation {
  readonly node: string;
  /** |p_i| / Σ|p_j|, between 0 and 1. */
  readonly share: number;
}

export interface Pole {
  /** The natural frequency in rad/s (negative real part when stable). */
  readonly s: Complex;
  /** |s| / 2π. */
  readonly hz: number;
  /** Damping ratio −re/|s| (1 for a real LHP pole, negative when unstable). */
  readonly damping: number;
  /**
   * Sorted by share, largest first, summing to 1. Internal nodes appear under a label tied to the statement
   * that made them (`miller a -> b (Rz–Cc junction)`, `indirect a -> b (buffer input)`); a nulling
   * resistor's junction is counted with the node it hangs from when the resistor carries under 10 % of
   * that node's swing in this mode, a buffer input with the node it feeds when the buffer passes on about
   * 90 % or more of a current injected there (docs/analysis.md).
   */
  readonly participation: readonly Participation[];
  /**
   * The shares per network node under their network names (`miller1.mid`), before any attribution. Only
   * present when the network has internal nodes.
   */
  readonly rawParticipation?: readonly Participation[];
  /** The design node holding ≥ 80 % of the pole (as shown in `participation`), or `shared` when none does. */
  readonly namedAfter: string | 'shared';
  /** Network check: last/first pivot of the equilibrated G + sC at this pole (near 0 for a true pole). */
  readonly residual?: number;
}

export interface Zero {
  readonly s: Complex;
  readonly hz: number;
  /** True when re(s) > 0 (a right-half-plane zero). */
  readonly rhp: boolean;
  /** Network check: last/first pivot of the equilibrated system matrix at this zero (near 0 when true). */
  readonly residual?: number;
}

/** One unity crossing of |L(jω)|. */
export interface Crossing {
  readonly hz: number;
  readonly direction: 'down' | 'up';
  /** Phase of L at the crossing in degrees, unwrapped from DC (0° at DC for negative feedback). */
  readonly phaseDeg: number;
}

export interface LoopMetrics {
  /** Loop gain at DC, β·|A(0)|, as V/V. */
  readonly dcGain: number;
  /** Every unity crossing of the loop gain, lowest frequency first. */
  readonly crossings: readonly Crossing[];
  /** The last downward crossing: the loop's unity-gain frequency. Absent when |L| never reaches 1. */
  readonly ugfHz?: number;
  /**
   * The lowest downward crossing: equal to `ugfHz` unless the loop gain crosses unity more than once. A
   * requirement for a minimum UGF is judged on this one, the conservative reading.
   */
  readonly lowestUgfHz?: number;
  /**
   * Phase margin in (−180°, 180°]: 180° + phase at each unity crossing, wrapped, and the smallest over
   * every crossing (the conservative reading when there are several).
   */
  readonly phaseMarginDeg?: number;
  /** The crossing at which `phaseMarginDeg` is read (Hz). */
  readonly phaseMarginHz?: number;
  /** −|L| in dB where the phase crosses −180° (the lowest such frequency). Absent when it never does. */
  readonly gainMarginDb?: number;
  readonly phaseCrossoverHz?: number;
  /** Peak of the closed-loop magnitude above its DC value, in dB (0 when there is no peak). */
  readonly peakingDb: number;
}

export interface StepResponse {
  /** Seconds. */
  readonly t: readonly number[];
  /** Closed-loop output for a unit input step. */
  readonly y: readonly number[];
  readonly final: number;
  /** Percent above final value (0 when monotone). */
  readonly overshootPct: number;
  /** Time to enter and stay in ±tolerance of final, for the tolerance asked; absent when it never settles. */
  readonly settlingTime?: number;
  readonly tolerance: number;
  /** The response's extreme in the direction of its final value, refined on the exact propagation. */
  readonly peak?: number;
}

/**
 * The closed loop's response to an input step of a stated size with each stage's current limited to its
 * bias (analysis/largeSignalStep.ts): slewing and linear settling together.
 */
export interface LargeSignalStep {
  /** The input step, volts. */
  readonly amplitude: number;
  readonly tolerance: number;
  /**
   * The output in volts at times in seconds, sign-normalised like `step` (σ·v(out) with a feedback
   * factor), from the instant after the step. The small-signal response to the same step is
   * amplitude·`step.y`.
   */
  readonly samples: { readonly t: readonly number[]; readonly y: readonly number[] };
  /** The output's final value, volts (the nonlinear equilibrium). */
  readonly final: number;
  /** Time to enter and stay within ±tolerance of `final`; absent when it does not within the span. */
  readonly settlingTime?: number;
  /** The small-signal settling time for the same tolerance, for comparison. */
  readonly smallSignalSettlingTime?: number;
  /** Total time during which some stage delivers more than 90 % of its bias. */
  readonly slewingTime: number;
  /** The spans of `slewingTime`, seconds. */
  readonly slewing: readonly { readonly start: number; readonly end: number }[];
  /** The largest |dy/dt| reached, V/s. */
  readonly slewRateReached: number;
  /** Percent beyond the final value (0 when it never passes it). */
  readonly overshootPct: number;
  /** The stage that spends the longest time above 90 % of its bias; absent when none does. */
  readonly limitingStage?: NodeName;
  /**
   * A stage still above 90 % of its bias at the final equilibrium: the step is beyond what the stages'
   * currents can hold, and `final` falls short of the linear final value.
   */
  readonly saturatedStage?: NodeName;
}

export interface SlewEstimate {
  /** V/s: the smallest of the node slew limits. */
  readonly rate: number;
  /** Each stage whose bias is given: its current, the capacitance it must charge, and I/C. */
  readonly limits: readonly {
    readonly stage: NodeName;
    readonly current: number;
    readonly cap: number;
    readonly rate: number;
  }[];
}

/** A classic hand formula beside the exact value it approximates. */
export interface HandEstimate {
  readonly quantity: 'dominant-pole' | 'nondominant-pole' | 'zero';
  readonly formula: string;
  /** rad/s magnitude from the formula (Infinity for a zero at infinity). */
  readonly hand: number;
  /** rad/s magnitude of the exact root it corresponds to. */
  readonly exact: number;
  /** |hand − exact| / |exact|. */
  readonly relativeError: number;
}

/** Why a network could not be analysed: a modelling error that the user must fix, located by node. */
export interface AnalysisProblem {
  readonly message: string;
  readonly node?: string;
}

/**
 * Stability of the closed loop judged from its own poles, whatever the margins say. `marginal`: a pole on
 * the imaginary axis to working precision (a sustained oscillation, or a pole at the origin that lets the
 * output drift).
 */
export type Stability =
  | { readonly verdict: 'stable'; readonly openLoopRhpPoles: number }
  | {
      readonly verdict: 'unstable' | 'marginal';
      /** The closed-loop poles in the right half-plane (or on the axis for `marginal`), upper half only. */
      readonly poles: readonly Complex[];
      /**
       * Poles of the open loop in the right half-plane. When there are any, margins read from a Bode plot
       * do not decide stability (the Nyquist criterion needs the encirclements, not the crossing).
       */
      readonly openLoopRhpPoles: number;
    };

export interface DesignAnalysis {
  readonly poles: readonly Pole[];
  readonly zeros: readonly Zero[];
  /** Open-loop DC gain from input to output, signed V/V. */
  readonly dcGain: number;
  /** Unity-gain frequency of the open-loop gain A(jω) (Hz), when it has one. */
  readonly openLoopUgfHz?: number;
  readonly loop: LoopMetrics;
  readonly step?: StepResponse;
  /** Why the step response was asked for but not computed (a refused tolerance, a value out of range). */
  readonly stepUnavailable?: string;
  readonly slew?: SlewEstimate;
  /** Present when a `settle` requirement states a `step`: the large-signal step response. */
  readonly largeSignalStep?: LargeSignalStep;
  /** Why the large-signal step was asked for but not computed. */
  readonly largeSignalStepUnavailable?: string;
  /** Present for designs that are the classic two-stage Miller case. */
  readonly hand?: readonly HandEstimate[];
  /** Non-empty when the network could not be solved; other fields are then empty. */
  readonly problems: readonly AnalysisProblem[];
  /** Poles of the closed loop σA/(1 + βσA), sorted by magnitude (rad/s). */
  readonly closedLoopPoles?: readonly Complex[];
  /** From `closedLoopPoles`; absent when the closed loop was not computed. */
  readonly stability?: Stability;
  /** Roots that did not pass the check against the network (the results are still given). */
  readonly warnings?: readonly string[];
  /**
   * Present when the loop is closed by the design's own elements (`feedback at NODE`): then `poles`,
   * `zeros`, `dcGain` and `loop` describe the loop gain T(s) = −v(NODE)/v(test) at the break, and this
   * holds the whole circuit's responses.
   */
  readonly closedCircuit?: ClosedCircuit;
  /**
   * The closed loop from `in` to the output: for `feedback beta`, σA/(1 + βσA) (the open loop's zeros over
   * the closed loop's poles); for `feedback at`, the whole circuit's. Absent when not computed.
   */
  readonly closedLoopGain?: Transfer;
  /**
   * The loop gain as one transfer: β·σ·A(s) for `feedback beta`, the return ratio T(s) for `feedback at`
   * (dc signed: positive for negative feedback). Its roots are `poles` and `zeros`.
   */
  readonly loopGain?: Transfer;
  /** −3 dB frequency of |closedLoopGain| relative to its DC value; absent when it never falls 3 dB. */
  readonly closedLoopBandwidthHz?: number;
}

/** Poles and zeros at one value of a swept component. */
export interface LocusPoint {
  readonly value: number;
  readonly poles: readonly Complex[];
  readonly zeros: readonly Complex[];
}

export type SynthesisResult =
  | {
      readonly ok: true;
      readonly value: number;
      readonly achieved: number;
      readonly note?: string;
      /** `value` rounded to 3 significant figures in the direction that still meets the target. */
      readonly rounded?: number;
      /** The quantity re-analysed at `rounded`. */
      readonly roundedAchieved?: number;
    }
  | { readonly ok: false; readonly reason: string };

/** Cooperative cancellation: long loops check this between steps and stop early. */
export interface CancelToken {
  readonly isCancellationRequested: boolean;
}

/** A transfer function in pole/zero/gain form, H(s) = k·Π(s − z)/Π(s − p) (roots in rad/s). */
export interface Transfer {
  readonly poles: readonly Complex[];
  readonly zeros: readonly Complex[];
  readonly k: number;
  /** H(0), signed (±Infinity with a pole at the origin). */
  readonly dc: number;
}

/** The band over which closed-circuit responses are plotted and their worst values searched (Hz). */
export interface FrequencyBand {
  readonly loHz: number;
  readonly hiHz: number;
}

/** The supply → output transfer of one `supply` node. Rejection is −20·log10|v(out)/v(supply)|. */
export interface SupplyRejection {
  readonly node: string;
  readonly transfer: Transfer;
  /** Rejection at DC, dB (positive when the output moves less than the supply). */
  readonly dcDb: number;
  /** The lowest rejection over `band`, dB, and where it is. */
  readonly worstDb: number;
  readonly worstHz: number;
}

/** The output's deviation for a load-current step of one ampere drawn from the output node. */
export interface LoadStepResponse {
  /** Seconds. */
  readonly t: readonly number[];
  /** v(out) deviation per ampere of step (V/A); negative when the output droops. */
  readonly y: readonly number[];
  /** The deviation's final value (V/A): −Zout(0). */
  readonly final: number;
  /** The largest |deviation| (V/A). */
  readonly peakDeviation: number;
  /** Time to enter and stay within ±tolerance·peakDeviation of the final value; absent when it never does. */
  readonly settlingTime?: number;
  readonly tolerance: number;
}

/**
 * A loop closed by the design's own elements (`feedback at NODE`): the whole circuit's responses. The
 * loop gain T(s) (from the break at the sensing transconductors) is the analysis' `poles`, `zeros` and
 * `loop`; these are the closed circuit's.
 */
export interface ClosedCircuit {
  readonly feedbackNode: string;
  /** The closed circuit's poles (its natural frequencies), with their participation in its nodes. */
  readonly poles: readonly Pole[];
  /** v(out)/i for a current injected into the output (Ω). */
  readonly outputImpedance: Transfer & {
    readonly dcOhm: number;
    readonly peakOhm: number;
    readonly peakHz: number;
  };
  readonly loadStep?: LoadStepResponse;
  /** One per `supply`, in text order. */
  readonly supplies: readonly SupplyRejection[];
  readonly band: FrequencyBand;
}

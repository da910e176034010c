// The document-level result that the server, the CLI and the tests all read: produced by analyzeDocument().
import type { DesignAnalysis } from './analysis/types';
import type { Finding } from './checks/types';
import type { DesignModel, DesignSource, ParsedDocument } from './language/model';
import type { SweepSummary } from './sweep/summary';

/** One analysed variant of a design. `corner` is `nominal` for the nominal model. */
export interface CornerRun {
  readonly corner: string;
  readonly model: DesignModel;
  readonly analysis: DesignAnalysis;
}

/** The worst value of one quantity over the corners, and the corner that sets it. */
export interface Worst {
  readonly value: number;
  readonly corner: string;
}

export interface WorstCase {
  /** Lowest phase margin (deg). */
  readonly phaseMarginDeg?: Worst;
  /** Lowest loop unity-gain frequency (Hz). */
  readonly ugfHz?: Worst;
  /** Lowest gain margin (dB). */
  readonly gainMarginDb?: Worst;
  /** Lowest slew rate (V/s). */
  readonly slew?: Worst;
  /** Longest settling time (s). */
  readonly settlingTime?: Worst;
  /** Lowest open-loop DC gain magnitude (dB). */
  readonly dcGainDb?: Worst;
}

export interface DesignReport {
  readonly source: DesignSource;
  /** Nominal first, then each corner that evaluated. */
  readonly runs: readonly CornerRun[];
  readonly worst: WorstCase;
  readonly findings: readonly Finding[];
  /**
   * Set when the design rules were not run on this design: with language errors its model lacks what they
   * dropped, and a rule's verdict on such a model would mislead. Its findings are then the language's.
   */
  readonly notChecked?: 'language-errors';
  /** The design's `sweep` statements, judged after the ordinary checks (absent when it has none). */
  readonly sweeps?: readonly SweepSummary[];
}

export interface DocumentReport {
  readonly parsed: ParsedDocument;
  readonly designs: readonly DesignReport[];
  /** Every finding in the document: language diagnostics first, then each design's checks. */
  readonly findings: readonly Finding[];
  /** Set when the analysis was cancelled: `designs` then holds only the designs finished before. */
  readonly cancelled?: boolean;
}

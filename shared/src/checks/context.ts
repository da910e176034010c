// What every check receives, and the engine operations a check needs to solve and re-check its fixes.
import type { CancelToken, DesignAnalysis, SynthesisResult } from '../analysis/types';
import type { DesignModel, DesignSource } from '../language/model';
import type { CornerRun } from '../report';
import type { CheckSettings } from './settings';
import type { Finding } from './types';

/**
 * The exact-model operations fixes are solved and re-checked with. The facade hands in the analysis
 * engine; without one, checks still report findings but offer no fixes (a fix is never estimated by a
 * hand formula).
 */
export interface CheckEngine {
  analyze(model: DesignModel, token?: CancelToken): DesignAnalysis;
  solveRzForZeroAtInfinity(model: DesignModel, millerIndex: number): SynthesisResult;
  solveRzToCancelPole(model: DesignModel, millerIndex: number): SynthesisResult;
}

export interface CheckInput {
  readonly source: DesignSource;
  /** Nominal first, then each corner that evaluated (as in DesignReport.runs). */
  readonly runs: readonly CornerRun[];
  readonly settings: CheckSettings;
  readonly engine?: CheckEngine;
  readonly token?: CancelToken;
}

/** A design rule: a pure function from the analysed design to its findings. */
export type Check = (input: CheckInput) => Finding[];

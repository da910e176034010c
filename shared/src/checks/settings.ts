// Check thresholds. Keys match the editor settings `ampnote.checks.<key>` and the CLI's --config file.
import { settleToleranceProblem } from '../analysis/settleTolerance';

export interface CheckSettings {
  /** Minimum phase margin, degrees, when the design states no `require pm`. */
  readonly phaseMargin: number;
  /** Minimum gain margin, dB. */
  readonly gainMargin: number;
  /** A RHP zero must lie at or above this many times the UGF. */
  readonly rhpZeroFactor: number;
  /** gm2 must be at least this many times gm1 when the zero is not controlled. */
  readonly gmRatio: number;
  /** The first non-dominant pole must lie at or above this many times the UGF. */
  readonly nondominantFactor: number;
  /** Complex non-dominant poles below this damping ratio are flagged. */
  readonly complexDamping: number;
  /** Closed-loop peaking above this many dB is flagged. */
  readonly peakingDb: number;
  /** A LHP zero within this fraction of a pole below the UGF forms a doublet. */
  readonly doubletSpread: number;
  /** A hand formula off the exact value by more than this fraction is flagged. */
  readonly approximationError: number;
  /** Settling tolerance used when a design states none, as a fraction. */
  readonly settleTolerance: number;
}

/** Defaults from docs/checks.md (sources there). */
export const DEFAULT_CHECK_SETTINGS: CheckSettings = {
  phaseMargin: 60,
  gainMargin: 10,
  rhpZeroFactor: 10,
  gmRatio: 10,
  nondominantFactor: 2.2,
  complexDamping: 0.5,
  peakingDb: 1,
  doubletSpread: 0.2,
  approximationError: 0.2,
  settleTolerance: 0.001,
};

/** Why `value` cannot be used for the setting `key` (words after the setting's name), or undefined. */
export function settingProblem(key: keyof CheckSettings, value: unknown): string | undefined {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) return 'must be a positive number';
  if (key === 'settleTolerance') {
    const problem = settleToleranceProblem(value);
    return problem === undefined ? undefined : `is refused: ${problem}`;
  }
  return undefined;
}

/** Merge user values over the defaults, ignoring any value settingProblem refuses. */
export function resolveCheckSettings(partial: unknown): CheckSettings {
  const out: Record<string, number> = { ...DEFAULT_CHECK_SETTINGS };
  if (partial && typeof partial === 'object') {
    for (const [key, value] of Object.entries(partial as Record<string, unknown>)) {
      if (key in out && settingProblem(key as keyof CheckSettings, value) === undefined) {
        out[key] = value as number;
      }
    }
  }
  return out as unknown as CheckSettings;
}

// All variants of a design analysed together: nominal first, then each corner that evaluated, and the
// worst value of each quantity with the corner that sets it.
import type { DesignSource } from '../language/model';
import type { CornerRun, Worst, WorstCase } from '../report';
import type { CancelToken } from './types';
import { analyzeDesign, type AnalyzeOptions } from './analyzeDesign';
import { gainDb } from '../units';

export function analyzeCorners(
  source: DesignSource,
  options: AnalyzeOptions = {},
  token?: CancelToken,
): { runs: CornerRun[]; worst: WorstCase } {
  const runs: CornerRun[] = [];
  if (source.nominal)
    runs.push({ corner: 'nominal', model: source.nominal, analysis: analyzeDesign(source.nominal, options) });
  for (const c of source.corners) {
    if (token?.isCancellationRequested) break;
    if (c.model) runs.push({ corner: c.name, model: c.model, analysis: analyzeDesign(c.model, options) });
  }
  return { runs, worst: worstCase(runs) };
}

/**
 * Worst per quantity over the runs that could be analysed. A run whose step response never settles sets
 * the settling time to Infinity.
 */
export function worstCase(runs: readonly CornerRun[]): WorstCase {
  const ok = runs.filter((r) => r.analysis.problems.length === 0);
  const pick = (value: (r: CornerRun) => number | undefined, lowest: boolean): Worst | undefined => {
    let best: Worst | undefined;
    for (const r of ok) {
      const v = value(r);
      if (v === undefined || Number.isNaN(v)) continue;
      if (!best || (lowest ? v < best.value : v > best.value)) best = { value: v, corner: r.corner };
    }
    return best;
  };
  const worst: {
    -readonly [K in keyof WorstCase]: WorstCase[K];
  } = {};
  const set = <K extends keyof WorstCase>(key: K, w: Worst | undefined) => {
    if (w) worst[key] = w;
  };
  set(
    'phaseMarginDeg',
    pick((r) => r.analysis.loop.phaseMarginDeg, true),
  );
  set(
    'ugfHz',
    pick((r) => r.analysis.loop.ugfHz, true),
  );
  set(
    'gainMarginDb',
    pick((r) => r.analysis.loop.gainMarginDb, true),
  );
  set(
    'slew',
    pick((r) => r.analysis.slew?.rate, true),
  );
  set(
    'settlingTime',
    pick((r) => (r.analysis.step ? (r.analysis.step.settlingTime ?? Infinity) : undefined), false),
  );
  set(
    'dcGainDb',
    pick((r) => gainDb(r.analysis.dcGain), true),
  );
  return worst;
}

// What the editor shows of a sweep (its code lens): the range of the phase margin over the swept values,
// the worst one found between samples included.
import type { SourceRange } from '../language/source';
import { REFINED, metricsOf, type MarginQuantity, type SweepExtreme, type SweepResult } from './sweepDesign';

export interface SweepSummary {
  readonly param: string;
  /** The `sweep` statement's line. */
  readonly range: SourceRange;
  /** Lowest (refined between samples) and highest (sampled) value of each margin over corners and range. */
  readonly margins: Partial<
    Record<MarginQuantity, { readonly lowest: SweepExtreme; readonly highest: number }>
  >;
  /** False when the sweep was cancelled before it finished. */
  readonly complete: boolean;
}

export function summarizeSweep(result: SweepResult, range: SourceRange): SweepSummary {
  const margins: SweepSummary['margins'] = {};
  for (const q of REFINED) {
    let lowest: SweepExtreme | undefined;
    for (const m of result.minima) {
      const e = m[q];
      if (e && (!lowest || e.value < lowest.value)) lowest = e;
    }
    let highest = -Infinity;
    for (const s of result.samples)
      for (const run of s.runs) {
        const v = run ? metricsOf(run.analysis)[q] : undefined;
        if (v !== undefined && v > highest) highest = v;
      }
    if (lowest && Number.isFinite(highest)) margins[q] = { lowest, highest };
  }
  return { param: result.spec.param, range, margins, complete: result.complete };
}

// What the editor shows of a sweep (its code lens): the range of the phase margin over the swept values,
// the worst one found between samples included.
import { formatDeg } from '../format/si';
import type { SourceRange } from '../language/source';
import { formatSweptValue } from './judgeSweep';
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
  /** Where the phase margin is lowest, for people (`2.1 mA`, with ` in hot` for a corner). */
  readonly worstText?: string;
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
  const pm = margins.phaseMarginDeg?.lowest;
  const worstText = pm
    ? `${formatSweptValue(result.spec, pm.at)}${result.corners.length > 1 ? ` in ${pm.corner}` : ''}`
    : undefined;
  return {
    param: result.spec.param,
    range,
    margins,
    complete: result.complete,
    ...(worstText ? { worstText } : {}),
  };
}

/** The code lens above a `sweep` line: `PM 38.2–71.0° over iload (worst 2.1 mA)`. */
export function sweepLensTitle(s: SweepSummary): string {
  const pm = s.margins.phaseMarginDeg;
  const body = pm
    ? `PM ${formatDeg(pm.lowest.value).replace('°', '')}–${formatDeg(pm.highest)} over ${s.param} (worst ${s.worstText})`
    : `PM — over ${s.param} (no unity crossing)`;
  return s.complete ? body : `${body} — sweep cancelled`;
}

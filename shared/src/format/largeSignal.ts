// The large-signal step in words: which part of the settling dominates, slewing or the linear tail, and the
// stage that limits the slewing with the current it has and the capacitance it charges. The settle check's
// finding, the requirement's hover and the terminal's analyze output all read this one sentence.
import type { LargeSignalStep, SlewEstimate } from '../analysis/types';
import { formatSi } from './si';

const ORDINALS = ['first', 'second', 'third', 'fourth', 'fifth', 'sixth', 'seventh', 'eighth'];

/** `the second stage` for a stage named by its rank, else `stage NAME`. */
const stageWords = (name: string) => (ORDINALS.includes(name) ? `the ${name} stage` : `stage ${name}`);

/**
 * `slewing 140 ns of 212 ns; the second stage limits: 95 uA into 13 pF; small-signal settling alone: 60 ns`,
 * or `no stage slews; …` when no stage passes 90 % of its bias.
 */
export function largeSignalSummary(l: LargeSignalStep, slew: SlewEstimate | undefined): string {
  if (l.saturatedStage !== undefined)
    return `the step is beyond the output's range: ${stageWords(l.saturatedStage)} stays at its current limit and the output ends at ${formatSi(l.final, 'V')}`;
  const small =
    l.smallSignalSettlingTime !== undefined
      ? `; small-signal settling alone: ${formatSi(l.smallSignalSettlingTime, 's')}`
      : '';
  if (l.slewingTime <= 0 || l.limitingStage === undefined) return `no stage slews${small}`;
  const total = l.settlingTime !== undefined ? ` of ${formatSi(l.settlingTime, 's')}` : '';
  const limit = slew?.limits.find((x) => x.stage === l.limitingStage);
  const detail = limit ? `: ${formatSi(limit.current, 'A')} into ${formatSi(limit.cap, 'F')}` : '';
  return `slewing ${formatSi(l.slewingTime, 's')}${total}; ${stageWords(l.limitingStage)} limits${detail}${small}`;
}

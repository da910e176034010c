// A design's `sweep` statements run and judged: each adds its findings (only when it finished) and a
// summary for the editor's code lens. The terminal runs them with the ordinary checks; the editor runs
// them after it has published the ordinary diagnostics (see sweepDocument.ts).
import type { CancelToken } from '../analysis/types';
import type { Finding } from '../checks/types';
import type { DesignSource } from '../language/model';
import { sweepFindings } from './judgeSweep';
import { summarizeSweep, type SweepSummary } from './summary';
import { specOf, sweepDesignSteps } from './sweepDesign';

export interface SweepOutcome {
  readonly findings: readonly Finding[];
  readonly summaries: readonly SweepSummary[];
  /** False when cancelled before every sweep finished. */
  readonly complete: boolean;
}

export function* runSweepsSteps(
  source: DesignSource,
  token?: CancelToken,
): Generator<void, SweepOutcome, void> {
  const findings: Finding[] = [];
  const summaries: SweepSummary[] = [];
  for (const sweep of source.nominal?.sweeps ?? []) {
    if (token?.isCancellationRequested) return { findings, summaries, complete: false };
    const spec = specOf(source, sweep);
    if (!spec) continue;
    const result = yield* sweepDesignSteps(source, spec, token);
    if (result.complete) findings.push(...sweepFindings(source, sweep.origin.range, result));
    summaries.push(summarizeSweep(result, sweep.origin.range));
  }
  return { findings, summaries, complete: !token?.isCancellationRequested };
}

export function runSweeps(source: DesignSource, token?: CancelToken): SweepOutcome {
  const steps = runSweepsSteps(source, token);
  for (;;) {
    const next = steps.next();
    if (next.done) return next.value;
  }
}

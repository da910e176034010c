// The editor's second pass over a document: the sweeps of every judged design, added to a report whose
// ordinary findings are already published. Sweeps take longer than the ordinary checks, so they come
// after them, in steps a caller can pause between and stop.
import type { CancelToken } from '../analysis/types';
import type { Finding } from '../checks/types';
import type { DesignSource } from '../language/model';
import type { DesignReport, DocumentReport } from '../report';
import { runSweepsSteps, type SweepOutcome } from './runSweeps';

/** Finished sweeps by design text and place (findings carry the place), kept per document by the caller. */
export type SweepMemo = Map<string, SweepOutcome>;

const memoKey = (s: DesignSource) => `${s.range.start.line}:${s.range.start.character}\u0000${s.text}`;

/** Whether the report has sweeps still to run (designs with language errors are not judged, nor swept). */
export function hasSweeps(report: DocumentReport): boolean {
  return report.designs.some((d) => !d.notChecked && (d.source.nominal?.sweeps?.length ?? 0) > 0);
}

/**
 * The report with every design's sweep findings and summaries added (the same report when it has no
 * sweeps); undefined when cancelled part-way.
 */
export function* sweepDocumentSteps(
  report: DocumentReport,
  token?: CancelToken,
  memo: SweepMemo = new Map(),
): Generator<void, DocumentReport | undefined, void> {
  if (!hasSweeps(report)) return report;
  const designs: DesignReport[] = [];
  const added: Finding[] = [];
  const keep = new Set<string>();
  for (const d of report.designs) {
    if (d.notChecked || !d.source.nominal?.sweeps?.length) {
      designs.push(d);
      continue;
    }
    const key = memoKey(d.source);
    keep.add(key);
    let outcome = memo.get(key);
    if (!outcome) {
      outcome = yield* runSweepsSteps(d.source, token);
      if (!outcome.complete || token?.isCancellationRequested) return undefined;
      memo.set(key, outcome);
    }
    added.push(...outcome.findings);
    designs.push({
      ...d,
      findings: [...d.findings, ...outcome.findings],
      ...(outcome.summaries.length ? { sweeps: outcome.summaries } : {}),
    });
  }
  for (const key of memo.keys()) if (!keep.has(key)) memo.delete(key);
  return { ...report, designs, findings: [...report.findings, ...added] };
}

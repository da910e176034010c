// The editor's two passes (ordinary findings, then the sweeps') end where the terminal's one pass does,
// and the second pass stops when cancelled.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { analyzeDocument, createAnalysisCache } from '../../../shared/src/service';
import { sweepDocumentSteps, type SweepMemo } from '../../../shared/src/sweep/sweepDocument';

const text = readFileSync('examples/twoStageLoadSweep.ampnote', 'utf8');
const key = (f: { code: string; message: string }) => `${f.code}: ${f.message}`;

function drive<T>(g: Generator<void, T, void>, onStep: (n: number) => void = () => undefined): T {
  for (let n = 0; ; n++) {
    const next = g.next();
    if (next.done) return next.value;
    onStep(n);
  }
}

describe('sweepDocumentSteps', () => {
  const inline = analyzeDocument(text);
  const deferred = analyzeDocument(text, undefined, undefined, createAnalysisCache({ sweeps: 'deferred' }));

  it('leaves the sweeps out of the first pass and adds exactly the one-pass findings in the second', () => {
    expect(deferred.findings.filter((f) => f.code === 'sweep')).toEqual([]);
    expect(deferred.designs[0]!.sweeps).toBeUndefined();
    const swept = drive(sweepDocumentSteps(deferred))!;
    expect(swept.findings.map(key).sort()).toEqual(inline.findings.map(key).sort());
    expect(swept.designs[0]!.sweeps).toEqual(inline.designs[0]!.sweeps);
  });

  it('returns nothing when cancelled part-way, and reuses a finished sweep of the same design text', () => {
    const token = { isCancellationRequested: false };
    const stopped = drive(sweepDocumentSteps(deferred, token), (n) => {
      if (n === 5) token.isCancellationRequested = true;
    });
    expect(stopped).toBeUndefined();
    const memo: SweepMemo = new Map();
    drive(sweepDocumentSteps(deferred, undefined, memo));
    let steps = 0;
    const again = drive(sweepDocumentSteps(deferred, undefined, memo), () => steps++);
    expect(steps).toBe(0);
    expect(again!.findings.map(key).sort()).toEqual(inline.findings.map(key).sort());
  });

  it('returns the same report for a document without sweeps', () => {
    const plain = analyzeDocument(text.replace(/\n\s*sweep cl .*\n/, '\n'));
    expect(drive(sweepDocumentSteps(plain))).toBe(plain);
  });
});

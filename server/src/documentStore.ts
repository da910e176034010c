// The server's state: for each open document, the report of its current version. Computed once per
// version (per-design results come from the document's analysis cache), read by every feature.
import type { TextDocument } from 'vscode-languageserver-textdocument';
import type { CancelToken } from '../../shared/src/analysis/types';
import type { CheckSettings } from '../../shared/src/checks/settings';
import type { DocumentReport } from '../../shared/src/report';
import {
  analyzeDocument,
  analyzeDocumentSteps,
  createAnalysisCache,
  type AnalysisCache,
} from '../../shared/src/service';
import { sweepDocumentSteps, type SweepMemo } from '../../shared/src/sweep/sweepDocument';

export interface Analyzed {
  readonly document: TextDocument;
  readonly report: DocumentReport;
}

interface Entry {
  version: number;
  settings: CheckSettings;
  report: DocumentReport;
  /** The report with the sweeps' findings and summaries added, once they have run for this version. */
  swept?: DocumentReport;
}

/** Hand the event loop back this often during a long analysis, so requests and edits get through. */
const SLICE_MS = 8;

export class DocumentStore {
  private readonly reports = new Map<string, Entry>();
  private readonly caches = new Map<string, AnalysisCache>();
  private readonly sweepMemos = new Map<string, SweepMemo>();

  constructor(
    private readonly get: (uri: string) => TextDocument | undefined,
    private readonly settingsOf: (uri: string) => CheckSettings,
  ) {}

  private cache(uri: string): AnalysisCache {
    let c = this.caches.get(uri);
    // Sweeps run after the ordinary diagnostics are out (see sweep()).
    if (!c)
      this.caches.set(uri, (c = createAnalysisCache({ stepResponse: 'when-required', sweeps: 'deferred' })));
    return c;
  }

  private fresh(uri: string, document: TextDocument, settings: CheckSettings): Entry | undefined {
    const e = this.reports.get(uri);
    return e && e.version === document.version && e.settings === settings ? e : undefined;
  }

  /**
   * The report of the document's current version: cached (with its sweeps once they have run), or
   * computed now (once for this version, without sweeps).
   */
  current(uri: string): Analyzed | undefined {
    const document = this.get(uri);
    if (!document) return undefined;
    const settings = this.settingsOf(uri);
    const have = this.fresh(uri, document, settings);
    if (have) return { document, report: have.swept ?? have.report };
    const report = analyzeDocument(document.getText(), settings, undefined, this.cache(uri));
    this.reports.set(uri, { version: document.version, settings, report });
    return { document, report };
  }

  /**
   * Analyze the current version without blocking the server: designs are analyzed in slices with the
   * event loop free in between. Undefined when cancelled or when the document changed meanwhile.
   */
  async analyze(uri: string, token: CancelToken): Promise<Analyzed | undefined> {
    const document = this.get(uri);
    if (!document) return undefined;
    const settings = this.settingsOf(uri);
    const have = this.fresh(uri, document, settings);
    if (have) return { document, report: have.report };
    const steps = analyzeDocumentSteps(document.getText(), settings, token, this.cache(uri));
    let sliceStart = Date.now();
    for (;;) {
      const next = steps.next();
      if (next.done) {
        if (next.value.cancelled || token.isCancellationRequested) return undefined;
        if (this.get(uri)?.version !== document.version) return undefined;
        this.reports.set(uri, { version: document.version, settings, report: next.value });
        return { document, report: next.value };
      }
      if (Date.now() - sliceStart >= SLICE_MS) {
        await new Promise<void>((resolve) => setImmediate(resolve));
        if (token.isCancellationRequested || this.get(uri)?.version !== document.version) return undefined;
        sliceStart = Date.now();
      }
    }
  }

  /**
   * The current version's report with its sweeps run, in slices like analyze(); the same report when the
   * document has no sweeps. Undefined when cancelled, when the document changed meanwhile, or when its
   * ordinary analysis has not been made yet.
   */
  async sweep(uri: string, token: CancelToken): Promise<Analyzed | undefined> {
    const document = this.get(uri);
    if (!document) return undefined;
    const entry = this.fresh(uri, document, this.settingsOf(uri));
    if (!entry) return undefined;
    if (entry.swept) return { document, report: entry.swept };
    let memo = this.sweepMemos.get(uri);
    if (!memo) this.sweepMemos.set(uri, (memo = new Map()));
    const steps = sweepDocumentSteps(entry.report, token, memo);
    let sliceStart = Date.now();
    for (;;) {
      const next = steps.next();
      if (next.done) {
        if (!next.value || token.isCancellationRequested) return undefined;
        if (this.get(uri)?.version !== document.version) return undefined;
        entry.swept = next.value;
        return { document, report: next.value };
      }
      if (Date.now() - sliceStart >= SLICE_MS) {
        await new Promise<void>((resolve) => setImmediate(resolve));
        if (token.isCancellationRequested || this.get(uri)?.version !== document.version) return undefined;
        sliceStart = Date.now();
      }
    }
  }

  /** The last report computed for `uri`, whatever its version (for features that can live with it). */
  last(uri: string): DocumentReport | undefined {
    const e = this.reports.get(uri);
    return e?.swept ?? e?.report;
  }

  evict(uri: string): void {
    this.reports.delete(uri);
    this.caches.delete(uri);
    this.sweepMemos.delete(uri);
  }

  /** Settings changed: every result may differ. */
  invalidateAll(): void {
    this.reports.clear();
    for (const c of this.caches.values()) c.clear();
    this.sweepMemos.clear();
  }

  uris(): string[] {
    return [...this.reports.keys()];
  }
}

// The one entry point to the core: text in, parsed designs, exact analyses and findings out. The language
// server, the terminal checker and the tests all call `analyzeDocument`.
import { readsTimeResponse } from './checks/measure';
import { withSolveFix } from './solve/solveFix';
import { analyzeCorners, analyzeDesign, solveRzForZeroAtInfinity, solveRzToCancelPole } from './analysis';
import type { CancelToken } from './analysis/types';
import type { CheckEngine } from './checks/context';
import { setOrInsertField, setValueEdit } from './checks/fixes';
import { withLazyFixes } from './checks/acrossRuns';
import { languageFindings, rangeContains, runChecks } from './checks/index';
import { resolveCheckSettings, type CheckSettings } from './checks/settings';
import type { Finding, TextEditSpec } from './checks/types';
import { formatSi } from './format/si';
import { hasCompensation, sweptCompensation } from './panel/buildPanelData';
import type { CompensationTarget } from './protocol/panelData';
import { createParseCache } from './incrementalParse';
import type { DesignModel, DesignSource, ParsedDocument } from './language/model';
import type { SourcePosition, SourceRange } from './language/source';
import type { CornerRun, DesignReport, DocumentReport } from './report';
import { splitLines } from './text/lines';
import { runSweeps } from './sweep/runSweeps';

/** The analysis engine as the checks use it to solve and re-check fixes. */
export const ENGINE: CheckEngine = {
  // Fix re-checks read poles, zeros and loop margins only: no step response, no participation.
  analyze: (model) => analyzeDesign(model, { step: false, participation: false }),
  solveRzForZeroAtInfinity,
  solveRzToCancelPole,
};

export interface AnalysisCacheOptions {
  /**
   * `always` (the default) computes every run's closed-loop step response; `when-required` only for
   * designs that state a `settle` or `loadstep` requirement (the editor's choice: the step is the costliest part, and
   * the panel computes its own).
   */
  readonly stepResponse?: 'always' | 'when-required';
  /**
   * `inline` (the default) runs each design's sweeps with its checks; `deferred` leaves them out, for a
   * caller that publishes the ordinary findings first and adds the sweeps' after (sweep/sweepDocument.ts:
   * the editor).
   */
  readonly sweeps?: 'inline' | 'deferred';
}

/**
 * Per-design results keyed by the design's exact text and the settings: an edit re-analyses only the
 * designs whose text changed. A design that only moved (lines added above it) is reused with its ranges
 * shifted. The document is parsed piece by piece too (see incrementalParse.ts). Keep one cache per
 * document.
 */
export interface AnalysisCache {
  readonly options: AnalysisCacheOptions;
  parse(text: string): ParsedDocument;
  /** `incomplete`: the design has language errors, so its model lacks what they dropped (see analyzeDesignSource). */
  design(
    source: DesignSource,
    settings: CheckSettings,
    token?: CancelToken,
    incomplete?: boolean,
  ): DesignReport;
  /**
   * Forget every design that is not among `sources` (called after each complete document pass). Keyed by
   * what the document holds, not by use, so two passes over the same text can interleave safely.
   */
  retain(sources: readonly DesignSource[], settings: CheckSettings): void;
  clear(): void;
  readonly size: number;
}

const settingsKeys = new WeakMap<CheckSettings, string>();
function cacheKey(source: DesignSource, settings: CheckSettings): string {
  let key = settingsKeys.get(settings);
  if (key === undefined) settingsKeys.set(settings, (key = JSON.stringify(settings)));
  return `${key}\u0000${source.text}`;
}

export function createAnalysisCache(options: AnalysisCacheOptions = {}): AnalysisCache {
  const entries = new Map<string, DesignReport>();
  const parser = createParseCache();
  return {
    options,
    parse: (text) => parser.parse(text),
    design(source, settings, token, incomplete = false) {
      // `incomplete` follows from the text, so the text and settings are the whole key.
      const key = cacheKey(source, settings);
      const hit = entries.get(key);
      if (hit) return relocate(hit, source);
      const report = analyzeDesignSource(source, settings, token, options, incomplete);
      if (!token?.isCancellationRequested) entries.set(key, report);
      return report;
    },
    retain(sources, settings) {
      const keep = new Set(sources.map((source) => cacheKey(source, settings)));
      for (const key of entries.keys()) if (!keep.has(key)) entries.delete(key);
    },
    clear: () => {
      entries.clear();
      parser.clear();
    },
    get size() {
      return entries.size;
    },
  };
}

/**
 * Analyse one design: every corner on the exact model, then every check. When the design has language
 * errors (`incomplete`), the statements they dropped are missing from its model: it is still analysed (for
 * hovers and the panel) but not judged, since a rule's verdict on a model missing a stage would mislead.
 */
export function analyzeDesignSource(
  source: DesignSource,
  settings: CheckSettings,
  token?: CancelToken,
  options: AnalysisCacheOptions = {},
  incomplete = false,
): DesignReport {
  const notChecked = incomplete ? { notChecked: 'language-errors' as const } : {};
  if (!source.nominal) return { source, runs: [], worst: {}, findings: [], ...notChecked };
  // The settling tolerance setting applies only where a design states none of its own.
  const statesSettle = source.nominal.requirements.some((r) => r.kind === 'settle');
  const statesTimeResponse = source.nominal.requirements.some(readsTimeResponse);
  const step = options.stepResponse !== 'when-required' || statesTimeResponse;
  const { runs, worst } = analyzeCorners(
    source,
    {
      ...(statesSettle ? {} : { settleTolerance: settings.settleTolerance }),
      ...(step ? {} : { step: false }),
    },
    token,
  );
  const input = { source, runs, settings, engine: ENGINE, token };
  // Impossible values (a zero or negative R, C or gm) are language errors: such a design is `incomplete`.
  const findings = incomplete
    ? []
    : [...problemFindings(source, runs), ...withSolveFix(runChecks(input), source, settings)];
  const sweeps = incomplete || options.sweeps === 'deferred' ? undefined : runSweeps(source, token);
  if (sweeps) findings.push(...sweeps.findings);
  return {
    source,
    runs,
    worst,
    findings,
    ...notChecked,
    ...(sweeps?.summaries.length ? { sweeps: sweeps.summaries } : {}),
  };
}

/** A network the engine cannot solve (a node with no DC path and no capacitance): an error at that node. */
function problemFindings(source: DesignSource, runs: readonly CornerRun[]): Finding[] {
  const seen = new Set<string>();
  const out: Finding[] = [];
  for (const run of runs) {
    for (const p of run.analysis.problems) {
      if (seen.has(p.message)) continue;
      seen.add(p.message);
      const stage = run.model.stages.find((s) => s.name === p.node);
      const decl = run.model.nodes.find((n) => n.name === p.node)?.range;
      out.push({
        code: 'plausibility',
        severity: 'error',
        message: `The network cannot be solved: ${p.message}`,
        design: source.name,
        range: stage?.origin.range ?? decl ?? source.nameRange,
        related: [],
        ...(runs.length > 1 ? { corners: [run.corner] } : {}),
        fixes: [],
      });
    }
  }
  return out;
}

/**
 * Parse and analyse a document, yielding after each design so that a caller can pause between designs
 * (and stop when `token` is cancelled: the generator then returns a report of the designs done so far,
 * marked `cancelled`).
 */
export function* analyzeDocumentSteps(
  text: string,
  settings?: Partial<CheckSettings>,
  token?: CancelToken,
  cache: AnalysisCache = createAnalysisCache(),
): Generator<number, DocumentReport, void> {
  const parsed = cache.parse(text);
  const resolved = resolveCheckSettings(settings);
  const designs: DesignReport[] = [];
  for (const source of parsed.designs) {
    if (token?.isCancellationRequested) return assemble(parsed, designs, true);
    const incomplete = parsed.diagnostics.some(
      (d) => d.severity === 'error' && rangeContains(source.range, d.range),
    );
    designs.push(cache.design(source, resolved, token, incomplete));
    yield designs.length;
  }
  if (token?.isCancellationRequested) return assemble(parsed, designs, true);
  cache.retain(parsed.designs, resolved);
  return assemble(parsed, designs, false);
}

/**
 * Analyse a whole `.ampnote` text.
 *
 * - `settings`: check thresholds (any subset of CheckSettings; invalid values fall back to the defaults).
 * - `token`: cooperative cancellation, checked between designs, corners and sweep steps.
 * - `cache`: reuse results of designs whose text did not change (see `createAnalysisCache`).
 *
 * Returns every design's runs (nominal first, then corners), worst case and findings, and the whole
 * document's findings (language diagnostics first). Never throws on bad input: errors are findings.
 * A design with language errors is analysed but not judged (its findings are the language's). Each
 * finding's `fixes` are solved on first read (and then kept): reading them runs the exact analysis again,
 * so read them only where they are shown or exported. When `token` is cancelled part-way, the report
 * holds the designs finished before and is marked `cancelled`.
 */
export function analyzeDocument(
  text: string,
  settings?: Partial<CheckSettings>,
  token?: CancelToken,
  cache?: AnalysisCache,
): DocumentReport {
  const steps = analyzeDocumentSteps(text, settings, token, cache);
  for (;;) {
    const next = steps.next();
    if (next.done) return next.value;
  }
}

function assemble(
  parsed: ParsedDocument,
  designs: readonly DesignReport[],
  cancelled: boolean,
): DocumentReport {
  const language = languageFindings(parsed);
  const taken = new Set(language.map((f) => `${f.code}@${rangeKey(f.range)}`));
  const findings = [...language];
  for (const d of designs) {
    for (const f of d.findings) if (!taken.has(`${f.code}@${rangeKey(f.range)}`)) findings.push(f);
  }
  return { parsed, designs, findings, ...(cancelled ? { cancelled: true } : {}) };
}

const rangeKey = (r: SourceRange) => `${r.start.line}:${r.start.character}-${r.end.line}:${r.end.character}`;

/** The design whose block contains `position`. */
export function designAt(report: DocumentReport, position: SourcePosition): DesignReport | undefined {
  return report.designs.find((d) => rangeContains(d.source.range, { start: position, end: position }));
}

/** The design named `name`. */
export function designNamed(report: DocumentReport, name: string): DesignReport | undefined {
  return report.designs.find((d) => d.source.name === name);
}

/**
 * Edits that write compensation values chosen elsewhere (the panel's sliders) into the element the panel
 * sweeps (`target`, else the first Miller capacitor, else the first buffered one; a target the design
 * does not have gives no edit): `cc` replaces its value (or its
 * parameter's); `rz` replaces or is inserted, and `rz = 0` removes the nulling resistor.
 */
export function compensationEdits(
  design: DesignReport,
  cc?: number,
  rz?: number,
  target?: CompensationTarget,
): TextEditSpec[] {
  const model = design.source.nominal;
  if (!model) return [];
  // A named element must exist: never write a value meant for one capacitor into another.
  if (target && !hasCompensation(model, target)) return [];
  const chosen = sweptCompensation(model, target);
  if (!chosen) return [];
  const isMiller = chosen.kind === 'miller';
  const item = isMiller ? model.millers[chosen.index]! : model.buffered[chosen.index]!;
  const edits: TextEditSpec[] = [];
  const ccField = item.origin.fields['cc'];
  if (cc !== undefined && cc > 0 && Number.isFinite(cc) && ccField) {
    const e = setValueEdit(model, ccField, formatSi(cc, 'F'));
    if (e) edits.push(e);
  }
  if (rz !== undefined && isMiller && Number.isFinite(rz)) {
    if (rz > 0) {
      const e = setOrInsertField(model, item.origin, 'rz', formatSi(rz, 'ohm'));
      if (e) edits.push(e);
    } else if (rz === 0 && item.origin.fields['rz']) {
      const e = removeFieldEdit(design.source, item.origin.fields['rz'].range, 'rz');
      if (e) edits.push(e);
    }
  }
  return edits;
}

/** Remove ` name = value` whose value occupies `value` (found in the design's own text). */
function removeFieldEdit(source: DesignSource, value: SourceRange, name: string): TextEditSpec | undefined {
  if (value.start.line !== value.end.line) return undefined;
  const line = splitLines(source.text).lines[value.start.line - source.range.start.line];
  if (line === undefined) return undefined;
  const offset = value.start.line === source.range.start.line ? source.range.start.character : 0;
  const before = line.slice(0, value.start.character - offset);
  const m = new RegExp(`\\s*\\b${name}\\s*=\\s*$`).exec(before);
  if (!m) return undefined;
  return {
    range: { start: { line: value.start.line, character: m.index + offset }, end: value.end },
    newText: '',
  };
}

// ---- moving a cached design report to where the same text now stands ----

function relocate(report: DesignReport, source: DesignSource): DesignReport {
  const dl = source.range.start.line - report.source.range.start.line;
  const dc = source.range.start.character - report.source.range.start.character;
  const firstLine = report.source.range.start.line;
  const runs = report.runs.map((r) => ({ ...r, model: freshModel(source, r.corner) ?? r.model }));
  if (dl === 0 && dc === 0) return { ...report, source, runs };
  const pos = (p: SourcePosition): SourcePosition => ({
    line: p.line + dl,
    character: p.line === firstLine ? p.character + dc : p.character,
  });
  const rng = (r: SourceRange): SourceRange => ({ start: pos(r.start), end: pos(r.end) });
  const findings = report.findings.map((f) => {
    const { fixes: _unread, ...rest } = Object.getOwnPropertyDescriptors(f);
    const base = Object.defineProperties({}, rest) as Omit<Finding, 'fixes'>;
    return withLazyFixes(
      { ...base, range: rng(f.range), related: f.related.map((x) => ({ ...x, range: rng(x.range) })) },
      () => f.fixes.map((fix) => ({ ...fix, edits: fix.edits.map((e) => ({ ...e, range: rng(e.range) })) })),
    );
  });
  return { ...report, source, runs, findings };
}

function freshModel(source: DesignSource, corner: string): DesignModel | undefined {
  return corner === 'nominal' ? source.nominal : source.corners.find((c) => c.name === corner)?.model;
}

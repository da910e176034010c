// The result of a `check` run that every output format reads, its summary and its exit status.
import type { Finding, Severity } from '../../shared/src/checks/types';
import type { SourceRange } from '../../shared/src/language/source';
import type { DesignReport, DocumentReport } from '../../shared/src/report';
import type { InputProblem } from './discover';

export interface FileResult {
  /** As shown to the user: relative to the working folder. */
  readonly path: string;
  readonly report: DocumentReport;
}

export interface RunResult {
  readonly files: readonly FileResult[];
  /** Inputs that could not be read or analyzed, and folders without design files. */
  readonly problems: readonly InputProblem[];
}

export interface Summary {
  readonly files: number;
  readonly designs: number;
  readonly errors: number;
  readonly warnings: number;
  readonly infos: number;
  readonly unreadable: number;
  /** Designs the design rules were not run on (language errors). */
  readonly notChecked: number;
}

/** Exit statuses, stable for CI scripts (docs/cli.md). */
export const EXIT_OK = 0;
export const EXIT_FINDINGS = 1;
export const EXIT_USAGE = 2;

export function summarize(run: RunResult): Summary {
  const count = (s: Severity) =>
    run.files.reduce((n, f) => n + f.report.findings.filter((x) => x.severity === s).length, 0);
  return {
    files: run.files.length,
    designs: run.files.reduce((n, f) => n + f.report.designs.length, 0),
    errors: count('error'),
    warnings: count('warning'),
    infos: count('info'),
    unreadable: run.problems.length,
    notChecked: run.files.reduce((n, f) => n + notCheckedDesigns(f.report).length, 0),
  };
}

/** An input problem outranks findings: a CI job must not pass because a file went unread. */
export function exitCodeOf(summary: Summary): number {
  if (summary.unreadable > 0) return EXIT_USAGE;
  return summary.errors > 0 ? EXIT_FINDINGS : EXIT_OK;
}

export function summaryLine(s: Summary): string {
  const parts = [
    plural(s.files, 'file'),
    plural(s.designs, 'design'),
    plural(s.errors, 'error'),
    plural(s.warnings, 'warning'),
  ];
  if (s.infos > 0) parts.push(plural(s.infos, 'info'));
  if (s.notChecked > 0) parts.push(`${plural(s.notChecked, 'design')} not checked`);
  if (s.unreadable > 0) parts.push(`${s.unreadable} unreadable input${s.unreadable === 1 ? '' : 's'}`);
  return parts.join(', ');
}

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;

/** Editor positions are 0-based (UTF-16 columns); people, compilers and SARIF count from 1. */
export interface OneBasedRange {
  readonly startLine: number;
  readonly startColumn: number;
  /** The line and column just after the last character (an empty range has end = start). */
  readonly endLine: number;
  readonly endColumn: number;
}

export function oneBased(range: SourceRange): OneBasedRange {
  return {
    startLine: range.start.line + 1,
    startColumn: range.start.character + 1,
    endLine: range.end.line + 1,
    endColumn: range.end.character + 1,
  };
}

/**
 * A design's findings as the document lists them: its language diagnostics and its checks, without the
 * duplicates the facade already removed. (DesignReport.findings holds only the checks.)
 */
export function findingsOfDesign(report: DocumentReport, design: string): Finding[] {
  return report.findings.filter((f) => f.design === design);
}

/** The designs the design rules skipped, in reading order. */
export function notCheckedDesigns(report: DocumentReport): DesignReport[] {
  return report.designs.filter((d) => d.notChecked !== undefined);
}

/** Why a design was not checked, in words (text and JSON say the same). */
export function notCheckedText(d: DesignReport): string {
  switch (d.notChecked) {
    case undefined:
      return '';
    case 'language-errors':
      return `design ${d.source.name} was not checked by the design rules: it has language errors; fix them first`;
  }
  const _: never = d.notChecked;
  return _;
}

/** Findings in reading order, so output is stable whatever order the checks ran in. */
export function sortedFindings(findings: readonly Finding[]): Finding[] {
  return findings
    .map((f, i) => ({ f, i }))
    .sort(
      (a, b) =>
        a.f.range.start.line - b.f.range.start.line ||
        a.f.range.start.character - b.f.range.start.character ||
        a.i - b.i,
    )
    .map((x) => x.f);
}

// `check --format json`: findings as plain data (schemaVersion 1, documented in docs/cli.md).
import type { Finding } from '../../shared/src/checks/types';
import type { SourceRange } from '../../shared/src/language/source';
import { CAUTION } from '../../shared/src/protocol/panelData';
import {
  exitCodeOf,
  notCheckedDesigns,
  notCheckedText,
  oneBased,
  sortedFindings,
  summarize,
  type RunResult,
  type Summary,
} from './run';

export const SCHEMA_VERSION = 1;

/**
 * Every place is given twice: `range` zero-based as in the editor protocol (line, UTF-16 character; what
 * an editor integration applies edits with) and `location` 1-based as the text format prints it.
 */
export interface PlaceJson {
  readonly range: SourceRange;
  readonly location: LocationJson;
}
export interface LocationJson {
  readonly line: number;
  readonly column: number;
  /** Just after the last character. */
  readonly endLine: number;
  readonly endColumn: number;
}

export interface FindingJson extends PlaceJson {
  readonly code: string;
  readonly severity: string;
  readonly message: string;
  readonly design: string | null;
  readonly corners: readonly string[] | null;
  readonly related: readonly (PlaceJson & { readonly message: string })[];
  readonly fixes: readonly {
    readonly title: string;
    readonly preferred: boolean;
    /** Present when no value meets the rule: why (edits are then empty). */
    readonly disabled?: string;
    readonly edits: readonly (PlaceJson & { readonly newText: string })[];
  }[];
}

export interface CheckJson {
  readonly schemaVersion: typeof SCHEMA_VERSION;
  readonly tool: { readonly name: 'ampnote'; readonly version: string };
  readonly files: readonly {
    readonly path: string;
    readonly designs: readonly string[];
    readonly findings: readonly FindingJson[];
    /** Designs the design rules were not run on, at their names. */
    readonly notChecked: readonly (PlaceJson & {
      readonly design: string;
      readonly reason: 'language-errors';
      readonly message: string;
    })[];
  }[];
  readonly problems: readonly { readonly path: string; readonly message: string }[];
  readonly summary: Summary;
  readonly exitCode: number;
  /** What the results are and are not (the same text as `analyze --json`). */
  readonly caution: string;
}

export function placeJson(range: SourceRange): PlaceJson {
  const r = oneBased(range);
  return {
    range: {
      start: { line: range.start.line, character: range.start.character },
      end: { line: range.end.line, character: range.end.character },
    },
    location: { line: r.startLine, column: r.startColumn, endLine: r.endLine, endColumn: r.endColumn },
  };
}

export function findingJson(f: Finding): FindingJson {
  return {
    code: f.code,
    severity: f.severity,
    message: f.message,
    design: f.design ?? null,
    corners: f.corners && f.corners.length > 0 ? [...f.corners] : null,
    ...placeJson(f.range),
    related: f.related.map((x) => ({ ...placeJson(x.range), message: x.message })),
    fixes: f.fixes.map((fix) => ({
      title: fix.title,
      preferred: fix.preferred === true,
      edits: fix.edits.map((e) => ({ ...placeJson(e.range), newText: e.newText })),
      ...(fix.disabled !== undefined ? { disabled: fix.disabled } : {}),
    })),
  };
}

export function checkJson(run: RunResult, version: string): CheckJson {
  const summary = summarize(run);
  return {
    schemaVersion: SCHEMA_VERSION,
    tool: { name: 'ampnote', version },
    files: run.files.map((file) => ({
      path: file.path,
      designs: file.report.designs.map((d) => d.source.name),
      findings: sortedFindings(file.report.findings).map(findingJson),
      notChecked: notCheckedDesigns(file.report).map((d) => ({
        design: d.source.name,
        reason: d.notChecked!,
        message: notCheckedText(d),
        ...placeJson(d.source.nameRange),
      })),
    })),
    problems: run.problems.map((p) => ({ path: p.path, message: p.message })),
    summary,
    exitCode: exitCodeOf(summary),
    caution: CAUTION,
  };
}

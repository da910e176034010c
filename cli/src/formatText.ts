// `check --format text`: one compiler-style line per finding, so editors and CI annotate the right spot.
import type { Finding } from '../../shared/src/checks/types';
import { notCheckedDesigns, notCheckedText, oneBased, sortedFindings, type FileResult } from './run';

/**
 * `path:line:col: severity code: message`, 1-based. Related places and fixes follow on indented lines, so
 * a pattern anchored at the line start matches only the finding itself.
 */
export function formatFindingText(path: string, f: Finding): string[] {
  const at = oneBased(f.range);
  const corners = f.corners && f.corners.length > 0 ? ` [${f.corners.join(', ')}]` : '';
  const lines = [
    `${path}:${at.startLine}:${at.startColumn}: ${f.severity} ${f.code}: ${oneLine(f.message)}${corners}`,
  ];
  for (const r of f.related) {
    const rel = oneBased(r.range);
    lines.push(`  ${path}:${rel.startLine}:${rel.startColumn}: note: ${oneLine(r.message)}`);
  }
  for (const fix of f.fixes) {
    lines.push(
      fix.disabled !== undefined
        ? `  no fix: ${oneLine(fix.title)}: ${oneLine(fix.disabled)}`
        : `  fix${fix.preferred ? ' (preferred)' : ''}: ${oneLine(fix.title)}`,
    );
  }
  return lines;
}

/**
 * The file's findings, then a note at each design the design rules skipped: with language errors a design
 * shows no rule findings, and the reader must not take that for a clean design. A `note` line does not
 * match the finding pattern, so it is not counted as a finding.
 */
export function formatFileText(file: FileResult): string[] {
  return [
    ...sortedFindings(file.report.findings).flatMap((f) => formatFindingText(file.path, f)),
    ...notCheckedDesigns(file.report).map((d) => {
      const at = oneBased(d.source.nameRange);
      return `${file.path}:${at.startLine}:${at.startColumn}: note: ${notCheckedText(d)}`;
    }),
  ];
}

/** A message is one line in this format; a line break inside would break line-based readers. */
const oneLine = (s: string) => s.replace(/\s*\r?\n\s*/g, ' ');

// `ampnote analyze FILE`: the exact results of one file's designs, as tables or as JSON.
import { resolve } from 'node:path';
import type { DesignReport, DocumentReport } from '../../shared/src/report';
import type { Command } from './args';
import { analyzeJson } from './analyzeJson';
import { formatAnalyzeText } from './analyzeText';
import { displayPath } from './checkCommand';
import type { CliContext } from './context';
import { formatFindingText } from './formatText';
import { readText, warn, writeOutput } from './io';
import { EXIT_FINDINGS, EXIT_OK, EXIT_USAGE, sortedFindings } from './run';

type AnalyzeCommand = Extract<Command, { kind: 'analyze' }>;

export type Loaded =
  | {
      readonly ok: true;
      readonly path: string;
      readonly report: DocumentReport;
      readonly designs: readonly DesignReport[];
    }
  | { readonly ok: false; readonly code: number };

/** Reads and analyzes one file, and picks the designs asked for; says what went wrong on stderr. */
export function loadDesigns(file: string, design: string | undefined, ctx: CliContext): Loaded {
  const abs = resolve(ctx.cwd, file);
  const path = displayPath(ctx.cwd, abs);
  const read = readText(abs);
  if (!read.ok) {
    warn(ctx.streams, `${path}: error: ${read.message}`);
    return { ok: false, code: EXIT_USAGE };
  }
  let report: DocumentReport;
  try {
    report = ctx.analyze(read.text, ctx.settings);
  } catch (err) {
    warn(
      ctx.streams,
      `${path}: error: internal error while analyzing: ${err instanceof Error ? err.message : String(err)}`,
    );
    return { ok: false, code: EXIT_USAGE };
  }
  if (report.designs.length === 0) {
    for (const f of sortedFindings(report.findings)) warn(ctx.streams, formatFindingText(path, f).join('\n'));
    warn(ctx.streams, `${path}: error: no design in this file`);
    return { ok: false, code: EXIT_USAGE };
  }
  if (design === undefined) return { ok: true, path, report, designs: report.designs };
  const picked = report.designs.filter((d) => d.source.name === design);
  if (picked.length === 0) {
    const names = report.designs.map((d) => d.source.name).join(', ');
    warn(ctx.streams, `${path}: error: no design named "${design}" (this file has: ${names})`);
    return { ok: false, code: EXIT_USAGE };
  }
  return { ok: true, path, report, designs: picked };
}

/** Error-level findings of the chosen designs, or of the file outside every design, fail the run. */
export function exitCodeForDesigns(report: DocumentReport, designs: readonly DesignReport[]): number {
  const chosen = new Set(designs.map((d) => d.source.name));
  const failing = report.findings.some(
    (f) => f.severity === 'error' && (f.design === undefined || chosen.has(f.design)),
  );
  return failing ? EXIT_FINDINGS : EXIT_OK;
}

export function runAnalyze(cmd: AnalyzeCommand, ctx: CliContext): number {
  const loaded = loadDesigns(cmd.file, cmd.design, ctx);
  if (!loaded.ok) return loaded.code;
  const { path, report, designs } = loaded;
  const body = cmd.json
    ? JSON.stringify(
        analyzeJson(report, designs, { file: path, version: ctx.version, settings: ctx.settings }),
        null,
        2,
      ) + '\n'
    : fileLevelText(path, report) + formatAnalyzeText(path, report, designs);
  if (cmd.output !== undefined) {
    const error = writeOutput(ctx.cwd, cmd.output, body, [cmd.file], cmd.config);
    if (error) {
      warn(ctx.streams, `ampnote: ${error}`);
      return EXIT_USAGE;
    }
  } else ctx.streams.stdout.write(body);
  return exitCodeForDesigns(report, designs);
}

/** Findings that belong to no design (text between designs that could not be read). */
function fileLevelText(path: string, report: DocumentReport): string {
  const loose = report.findings.filter((f) => f.design === undefined);
  if (loose.length === 0) return '';
  return (
    [
      'outside any design',
      ...sortedFindings(loose).flatMap((f) => formatFindingText(path, f).map((l) => '  ' + l)),
    ].join('\n') + '\n\n'
  );
}

// `ampnote check`: every design in the named files and folders, in one of three output formats.
import { join, relative, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Command } from './args';
import type { CliContext } from './context';
import { discoverFiles, type InputProblem } from './discover';
import { checkJson } from './formatJson';
import { sarifLog } from './formatSarif';
import { formatFileText } from './formatText';
import { readText, writeOutput, warn } from './io';
import { createProgress } from './progress';
import { CAUTION } from '../../shared/src/protocol/panelData';
import { wrapWords } from './wrap';
import { exitCodeOf, summarize, summaryLine, EXIT_USAGE, type FileResult, type RunResult } from './run';

type CheckCommand = Extract<Command, { kind: 'check' }>;

/** Path shown to the user: relative to the working folder, as a compiler prints it. */
export const displayPath = (cwd: string, abs: string) => relative(cwd, abs) || abs;

export function runCheck(cmd: CheckCommand, ctx: CliContext): number {
  const { stderr, stdout } = ctx.streams;
  const discovery = discoverFiles(cmd.paths, ctx.cwd);
  const problems: InputProblem[] = [...discovery.problems];
  for (const p of discovery.problems) warn(ctx.streams, `${p.path}: error: ${p.message}`);

  // Text goes out file by file, so a long run shows its findings as it goes; the JSON formats are one value.
  const streaming = cmd.format === 'text' && cmd.output === undefined;
  const textLines: string[] = [];
  const progress = createProgress(stderr, !cmd.quiet);
  const files: FileResult[] = [];
  const total = discovery.files.length;

  discovery.files.forEach((abs, i) => {
    const path = displayPath(ctx.cwd, abs);
    progress.step(i, total, `checking ${path}`);
    const read = readText(abs);
    if (!read.ok) {
      progress.done();
      problems.push({ path, message: read.message });
      warn(ctx.streams, `${path}: error: ${read.message}`);
      return;
    }
    let file: FileResult;
    try {
      file = { path, report: ctx.analyze(read.text, ctx.settings) };
    } catch (err) {
      progress.done();
      const message = `internal error while analyzing: ${err instanceof Error ? err.message : String(err)}`;
      problems.push({ path, message });
      warn(ctx.streams, `${path}: error: ${message}`);
      return;
    }
    files.push(file);
    if (file.report.designs.length === 0 && file.report.findings.length === 0) {
      progress.done();
      warn(ctx.streams, `${path}: warning: no design in this file`);
    }
    if (cmd.format === 'text') {
      const lines = formatFileText(file);
      if (streaming) {
        if (lines.length > 0) {
          progress.done();
          stdout.write(lines.join('\n') + '\n');
        }
      } else textLines.push(...lines);
    }
  });
  progress.done();

  const run: RunResult = { files, problems };
  const summary = summarize(run);
  const code = exitCodeOf(summary);
  let body: string;
  switch (cmd.format) {
    case 'text':
      body =
        textLines.map((l) => l + '\n').join('') +
        (cmd.quiet ? '' : `${summaryLine(summary)}\n${wrapWords(`Note: ${CAUTION}`).join('\n')}\n`);
      break;
    case 'json':
      body = JSON.stringify(checkJson(run, ctx.version), null, 2) + '\n';
      break;
    case 'sarif':
      body =
        JSON.stringify(
          sarifLog(run, { version: ctx.version, cwd: ctx.cwd, docsUri: docsUri(ctx) }),
          null,
          2,
        ) + '\n';
      break;
  }
  if (cmd.output !== undefined) {
    const error = writeOutput(ctx.cwd, cmd.output, body, discovery.files, cmd.config);
    if (error) {
      warn(ctx.streams, `ampnote: ${error}`);
      return EXIT_USAGE;
    }
  } else stdout.write(body);
  if (!cmd.quiet && cmd.format !== 'text') warn(ctx.streams, summaryLine(summary));
  return code;
}

/** The checks documentation shipped with the package, as an absolute `file:` URI (SARIF wants absolute links). */
export function docsUri(ctx: CliContext): string {
  return pathToFileURL(resolve(join(ctx.packageRoot, 'docs', 'checks.md'))).href;
}

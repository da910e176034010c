// Entry point of the `ampnote` terminal checker (bundled to dist/cli.js).
import { dirname, resolve } from 'node:path';
import { version } from '../../package.json';
import { DEFAULT_CHECK_SETTINGS, type CheckSettings } from '../../shared/src/checks/settings';
import { analyzeDocument } from '../../shared/src/service';
import { parseArgs, type Command } from './args';
import { runAnalyze } from './analyzeCommand';
import { runCheck } from './checkCommand';
import { parseConfig } from './config';
import type { CliContext } from './context';
import { readText, warn, type Streams } from './io';
import { runReport } from './reportCommand';
import { runSolve } from './solveCommand';
import { runSweep } from './sweepCommand';
import { EXIT_OK, EXIT_USAGE } from './run';
import { usage } from './usage';

export function main(argv: readonly string[], streams: Streams, cwd: string, packageRoot: string): number {
  // No command at all is a mistake in a script: the usage goes where errors go, with the usage status.
  if (argv.length === 0) {
    streams.stderr.write(usage());
    return EXIT_USAGE;
  }
  const parsed = parseArgs(argv);
  if (!parsed.ok) {
    warn(streams, `ampnote: ${parsed.error}`);
    warn(streams, `Run 'ampnote ${parsed.topic ? parsed.topic + ' ' : ''}--help' for usage.`);
    return EXIT_USAGE;
  }
  const cmd = parsed.command;
  if (cmd.kind === 'help') {
    streams.stdout.write(usage(cmd.topic));
    return EXIT_OK;
  }
  if (cmd.kind === 'version') {
    streams.stdout.write(`${version}\n`);
    return EXIT_OK;
  }
  const settings = loadSettings(cmd, cwd, streams);
  if (!settings) return EXIT_USAGE;
  const ctx: CliContext = { cwd, streams, version, packageRoot, settings, analyze: analyzeDocument };
  switch (cmd.kind) {
    case 'check':
      return runCheck(cmd, ctx);
    case 'analyze':
      return runAnalyze(cmd, ctx);
    case 'report':
      return runReport(cmd, ctx);
    case 'solve':
      return runSolve(cmd, ctx);
    case 'sweep':
      return runSweep(cmd, ctx);
    default: {
      const never: never = cmd;
      return never;
    }
  }
}

/** A bad config file stops the run: results under thresholds the user did not mean would mislead. */
function loadSettings(
  cmd: Extract<Command, { config?: string }>,
  cwd: string,
  streams: Streams,
): CheckSettings | undefined {
  if (cmd.config === undefined) return DEFAULT_CHECK_SETTINGS;
  const read = readText(resolve(cwd, cmd.config));
  if (!read.ok) {
    warn(streams, `${cmd.config}: error: cannot read config file: ${read.message}`);
    return undefined;
  }
  const parsed = parseConfig(read.text);
  if (!parsed.ok) {
    warn(streams, `${cmd.config}: error: ${parsed.error}`);
    return undefined;
  }
  for (const w of parsed.warnings) warn(streams, `${cmd.config}: warning: ${w}`);
  return parsed.settings;
}

// Run only as the program itself, not when a test imports the module.
if (require.main === module) {
  // A reader that stops early (`| head`) closes the pipe: stop quietly rather than crash.
  process.stdout.on('error', (err: NodeJS.ErrnoException) => {
    if (err.code === 'EPIPE') process.exit(process.exitCode ?? 0);
    throw err;
  });
  try {
    process.exitCode = main(
      process.argv.slice(2),
      process,
      process.cwd(),
      resolve(dirname(__filename), '..'),
    );
  } catch (err) {
    // A fault of ours must not read as "findings" (status 1) to a CI script.
    process.stderr.write(
      `ampnote: internal error: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}\n`,
    );
    process.exitCode = EXIT_USAGE;
  }
}

// `ampnote report FILE -o OUT.html`: the designs' values, findings and charts in one self-contained page.
import { resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { buildPanelData } from '../../shared/src/panel/buildPanelData';
import type { Command } from './args';
import { CHARTS_SCRIPT } from './chartsScript';
import { exitCodeForDesigns, loadDesigns } from './analyzeCommand';
import type { CliContext } from './context';
import { renderReport, type ReportDesign } from './htmlReport';
import { warn, writeOutput } from './io';
import { createProgress } from './progress';
import { EXIT_USAGE, findingsOfDesign, summaryLine } from './run';

type ReportCommand = Extract<Command, { kind: 'report' }>;

export function runReport(cmd: ReportCommand, ctx: CliContext): number {
  const loaded = loadDesigns(cmd.file, cmd.design, ctx);
  if (!loaded.ok) return loaded.code;
  const { path, report, designs } = loaded;
  const uri = pathToFileURL(resolve(ctx.cwd, cmd.file)).href;

  // The chart sweeps are the slow part of a report: show which design is being drawn when it takes a while.
  const progress = createProgress(ctx.streams.stderr, !cmd.quiet);
  const entries: ReportDesign[] = designs.map((d, i) => {
    progress.step(i, designs.length, `charts for ${d.source.name}`);
    const model = d.source.nominal;
    let panel;
    if (model && d.runs.length > 0) {
      try {
        panel = buildPanelData(model, uri, {
          settleTolerance: ctx.settings.settleTolerance,
          // The design's source gives the panel its sweeps (and free parameters at their written values).
          source: d.source,
        });
      } catch (err) {
        progress.done();
        warn(
          ctx.streams,
          `${path}: warning: charts of design "${d.source.name}" not drawn: ${err instanceof Error ? err.message : String(err)}`,
        );
      }
    }
    return { report: d, findings: findingsOfDesign(report, d.source.name), panel };
  });

  progress.done();
  const html = renderReport({
    file: path,
    version: ctx.version,
    generated: new Date().toISOString().replace(/\.\d+Z$/, 'Z'),
    designs: entries,
    fileFindings: report.findings.filter((f) => f.design === undefined),
    chartsScript: CHARTS_SCRIPT,
  });
  const error = writeOutput(ctx.cwd, cmd.output, html, [cmd.file], cmd.config);
  if (error) {
    warn(ctx.streams, `ampnote: ${error}`);
    return EXIT_USAGE;
  }
  const code = exitCodeForDesigns(report, designs);
  if (!cmd.quiet) {
    const findings = entries.flatMap((e) => e.findings);
    const summary = summaryLine({
      files: 1,
      designs: designs.length,
      errors: findings.filter((f) => f.severity === 'error').length,
      warnings: findings.filter((f) => f.severity === 'warning').length,
      infos: findings.filter((f) => f.severity === 'info').length,
      unreadable: 0,
      notChecked: designs.filter((d) => d.notChecked !== undefined).length,
    });
    warn(ctx.streams, `wrote ${cmd.output} (${summary})`);
  }
  return code;
}

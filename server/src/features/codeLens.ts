// Above each design: UGF, PM and the worst corner, and a lens that opens the pole-split panel. Above each
// `sweep`: the range of the phase margin over the swept values and where it is lowest.
import type { CodeLens } from 'vscode-languageserver';
import { formatDeg, formatHz } from '../../../shared/src/format/si';
import type { DocumentReport } from '../../../shared/src/report';
import { toRange } from '../convert';
import { nominal } from './describe';
import { hasFreeParameters } from '../../../shared/src/solve/solveFix';
import { sweepLensTitle } from '../../../shared/src/sweep/summary';

export const SHOW_PANEL_COMMAND = 'ampnote.showPanel';
export const SOLVE_COMMAND = 'ampnote.solveFreeParameters';

export function codeLenses(report: DocumentReport, uri: string): CodeLens[] {
  const lenses: CodeLens[] = [];
  for (const design of report.designs) {
    const range = toRange(design.source.nameRange);
    const run = nominal(design);
    let title: string;
    if (!design.source.nominal) title = 'not analyzed: see the errors in this design';
    else if (!run)
      title = `not analyzed: ${design.runs[0]?.analysis.problems[0]?.message ?? 'the network could not be solved'}`;
    else {
      const loop = run.analysis.loop;
      const parts = [
        `UGF ${loop.ugfHz !== undefined ? formatHz(loop.ugfHz) : '—'}`,
        `PM ${loop.phaseMarginDeg !== undefined ? formatDeg(loop.phaseMarginDeg) : '—'}`,
      ];
      const w = design.worst.phaseMarginDeg;
      if (design.runs.length > 1 && w) parts.push(`worst ${w.corner} (PM ${formatDeg(w.value)})`);
      title = parts.join(' · ');
    }
    lenses.push({ range, command: { title, command: '' } });
    if (hasFreeParameters(design.source)) {
      lenses.push({
        range,
        command: {
          title: 'Solve free parameters',
          command: SOLVE_COMMAND,
          arguments: [{ uri, design: design.source.name }],
        },
      });
    }
    for (const sweep of design.sweeps ?? [])
      lenses.push({ range: toRange(sweep.range), command: { title: sweepLensTitle(sweep), command: '' } });
    if (design.source.nominal) {
      lenses.push({
        range,
        command: {
          title: 'show pole split',
          command: SHOW_PANEL_COMMAND,
          arguments: [{ uri, design: design.source.name }],
        },
      });
    }
  }
  return lenses;
}

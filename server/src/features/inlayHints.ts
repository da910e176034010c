// Inline values at the end of lines: poles and zeros after a compensation line, the pole a stage names,
// and each requirement's measured value with pass/fail.
import { feedbackNode } from '../../../shared/src/language/model';
import { InlayHintKind, type InlayHint, type Range } from 'vscode-languageserver';
import type { TextDocument } from 'vscode-languageserver-textdocument';
import type { DocumentReport } from '../../../shared/src/report';
import { firstLine } from '../../../shared/src/text/lines';
import { rangesMeet } from '../convert';
import { feedbackLoopText, supplyText } from '../../../shared/src/format/closedCircuit';
import { nominal, poleText, requirementAcrossRuns, shownPoles, sortedByHz, zeroText } from './describe';

/** The end of `line`, before its line break (whichever of \n, \r\n or \r it is). */
function endOfLine(document: TextDocument, line: number) {
  const text = document.getText({ start: { line, character: 0 }, end: { line: line + 1, character: 0 } });
  return { line, character: firstLine(text).length };
}

export function inlayHints(report: DocumentReport, document: TextDocument, range: Range): InlayHint[] {
  const hints: InlayHint[] = [];
  const add = (line: number, label: string) =>
    hints.push({
      position: endOfLine(document, line),
      label: `  ${label}`,
      kind: InlayHintKind.Parameter,
      paddingLeft: true,
    });
  for (const design of report.designs) {
    if (!rangesMeet(design.source.range, range)) continue;
    const run = nominal(design);
    const model = design.source.nominal;
    if (!run || !model) continue;
    const a = run.analysis;
    const comps = [...model.millers, ...model.buffered];
    for (const c of comps) {
      if (!rangesMeet(c.origin.range, range)) continue;
      const poles = shownPoles(a.poles).map(poleText).join(', ');
      const zeros = sortedByHz(a.zeros).map(zeroText).join(', ');
      add(c.origin.range.end.line, `poles ${poles || 'none'} · zeros ${zeros || 'none'}`);
    }
    for (const s of model.stages) {
      if (!rangesMeet(s.origin.range, range)) continue;
      const named = shownPoles(a.poles).filter((p) => p.namedAfter === s.name);
      if (named.length) add(s.origin.range.end.line, `pole ${named.map(poleText).join(', ')}`);
    }
    const at = feedbackNode(model);
    if (at && rangesMeet(at.origin.range, range)) add(at.origin.range.end.line, feedbackLoopText(a));
    for (const s of model.supplies ?? []) {
      const text = supplyText(a, s.node);
      if (text && rangesMeet(s.origin.range, range)) add(s.origin.range.end.line, `${s.node}: ${text}`);
    }
    for (const req of model.requirements) {
      if (!rangesMeet(req.origin.range, range)) continue;
      const r = requirementAcrossRuns(design, req);
      const m = r.nominal;
      if (!m) continue;
      const worst =
        r.runs.length > 1 && r.worst && r.worst.corner !== 'nominal'
          ? ` · worst ${r.worst.corner}: ${r.worst.m.measured} ${r.worst.m.pass ? '✓' : '✗'}`
          : '';
      add(req.origin.range.end.line, `${m.measured} ${m.pass ? '✓' : '✗'}${worst}`);
    }
  }
  return hints;
}

// Hover: what an element is, its value in display units, the poles and zeros it takes part in (with each
// node's share), the hand estimate beside the exact value; for a requirement, measured against required.
import { SENSITIVITY_STEP, sensitivities, sensitivityText } from '../../../shared/src/solve/sensitivities';
import { closedLoopSummary } from '../../../shared/src/format/closedLoop';
import { closedCircuitLines, feedbackLoopText, supplyText } from '../../../shared/src/format/closedCircuit';
import type { Hover } from 'vscode-languageserver';
import type { DesignAnalysis } from '../../../shared/src/analysis/types';
import { formatDeg, formatSi } from '../../../shared/src/format/si';
import { formatDcGain, formatGainMargin } from '../../../shared/src/format/quantities';
import { fixedNumber, NOT_COMPUTED, plainNumber } from '../../../shared/src/format/special';
import type { SourcePosition } from '../../../shared/src/language/source';
import type { NodeRef } from '../../../shared/src/language/model';
import { CAUTION } from '../../../shared/src/protocol/panelData';
import type { DocumentReport, DesignReport } from '../../../shared/src/report';
import { rangeContains } from '../../../shared/src/checks/index';
import { designAt } from '../../../shared/src/service';
import { toRange } from '../convert';
import { nominal, poleText, polesOf, requirementAcrossRuns, sortedByHz, zeroText } from './describe';
import { statementAt, targetAt, type Target } from './target';

const UNIT_OF_DIMENSION: Record<string, string> = {
  ohm: 'ohm',
  S: 'S',
  F: 'F',
  A: 'A',
  V: 'V',
  s: 's',
  Hz: 'Hz',
  'V/s': 'V/s',
};

const refName = (r: NodeRef) => (r.kind === 'ground' ? 'ground' : r.name);

function valueText(value: number, dimension: string): string {
  if (dimension === 'deg') return `${plainNumber(value, 4)} deg`;
  if (dimension === 'dB') return `${plainNumber(value, 4)} dB`;
  if (dimension === '1') return plainNumber(value, 4);
  if (dimension === 'ugf') return `${plainNumber(value, 4)} × UGF`;
  const unit = UNIT_OF_DIMENSION[dimension];
  return unit ? formatSi(value, unit) : `${plainNumber(value, 4)} ${dimension}`;
}

function poleLines(analysis: DesignAnalysis, nodes: string[]): string[] {
  const mine = polesOf(analysis, nodes);
  if (!mine.length) return [`Takes part in no pole (no capacitance at ${nodes.join(', ')}).`];
  return [
    'Poles it takes part in (share of each node):',
    ...mine.map(
      ({ pole, shares }) =>
        `- ${poleText(pole)} — ${shares}` +
        (pole.namedAfter === 'shared' ? ' (shared: no node holds 80 %, so no single node sets it)' : ''),
    ),
  ];
}

function zeroLines(analysis: DesignAnalysis): string[] {
  const zeros = sortedByHz(analysis.zeros);
  if (!zeros.length) return ['Zeros: none finite.'];
  return [`Zeros: ${zeros.map(zeroText).join(', ')}`];
}

const HAND_LABEL = {
  'dominant-pole': 'dominant pole',
  'nondominant-pole': 'non-dominant pole',
  zero: 'zero',
} as const;

function handLines(analysis: DesignAnalysis): string[] {
  if (!analysis.hand?.length) return [];
  return [
    'Hand estimate vs exact:',
    ...analysis.hand.map((h) => {
      const hand = Number.isFinite(h.hand) ? formatSi(h.hand / (2 * Math.PI), 'Hz') : '∞';
      const pct = Number.isFinite(h.relativeError) ? ` (${fixedNumber(h.relativeError * 100, 1)} % off)` : '';
      return `- ${HAND_LABEL[h.quantity]}: \`${h.formula}\` = ${hand}, exact ${formatSi(h.exact / (2 * Math.PI), 'Hz')}${pct}`;
    }),
  ];
}

/** The nodes a statement connects (where a parameter it uses acts). */
function nodesOf(t: Target): string[] {
  switch (t.kind) {
    case 'stage':
      return [t.stage.name];
    case 'miller':
    case 'buffered':
      return [t.item.from, t.item.to];
    case 'load':
      return [t.item.node];
    case 'element': {
      const e = t.item;
      return (e.kind === 'gm' ? [e.control, e.output] : [e.a, e.b]).flatMap((n) =>
        n.kind === 'node' ? [n.name] : [],
      );
    }
    default:
      return [];
  }
}

function body(design: DesignReport, target: Target): string[] | undefined {
  const run = nominal(design);
  const a = run?.analysis;
  switch (target.kind) {
    case 'stage': {
      const s = target.stage;
      const head = [
        `**stage ${s.name}** (${s.polarity}, input ${refName(s.input)}${s.inputN ? ` − ${refName(s.inputN)}` : ''})`,
        `gm = ${formatSi(s.gm, 'S')}, rout = ${formatSi(s.rout, 'ohm')}, cap = ${formatSi(s.cap, 'F')}` +
          (s.bias !== undefined ? `, bias = ${formatSi(s.bias, 'A')}` : '') +
          ` — DC gain gm·rout = ${plainNumber(s.gm * s.rout, 3)} V/V`,
      ];
      return a ? [...head, '', ...poleLines(a, [s.name]), '', ...handLines(a)] : head;
    }
    case 'miller':
    case 'buffered': {
      const m = target.item;
      const rz = target.kind === 'miller' ? target.item.rz : undefined;
      const head = [
        `**${target.kind === 'miller' ? 'Miller capacitor' : 'indirect compensation capacitor'}** ${m.from} → ${m.to}`,
        `cc = ${formatSi(m.cc, 'F')}` +
          (rz !== undefined
            ? `, rz = ${formatSi(rz, 'ohm')}`
            : target.kind === 'miller'
              ? ', no nulling resistor'
              : ''),
      ];
      return a
        ? [...head, '', ...poleLines(a, [m.from, m.to]), '', ...zeroLines(a), '', ...handLines(a)]
        : head;
    }
    case 'load': {
      const l = target.item;
      const head = [
        `**load** at ${l.node}`,
        [
          l.cap !== undefined ? `cap = ${formatSi(l.cap, 'F')}` : '',
          l.res !== undefined ? `res = ${formatSi(l.res, 'ohm')}` : '',
        ]
          .filter(Boolean)
          .join(', '),
      ];
      return a ? [...head, '', ...poleLines(a, [l.node])] : head;
    }
    case 'element': {
      const e = target.item;
      const unit = e.kind === 'res' ? 'ohm' : e.kind === 'cap' ? 'F' : 'S';
      const nodes = (e.kind === 'gm' ? [e.control, e.output] : [e.a, e.b]).flatMap((n) =>
        n.kind === 'node' ? [n.name] : [],
      );
      const head = [`**element ${e.kind}** ${nodes.join(' – ')}`, `value = ${formatSi(e.value, unit)}`];
      if (!a) return head;
      return e.kind === 'cap'
        ? [...head, '', ...poleLines(a, nodes), ...zeroLines(a)]
        : [...head, '', ...zeroLines(a)];
    }
    case 'param': {
      const p = target.item;
      const uses =
        design.source.symbols.find((x) => x.kind === 'param' && x.name === p.name)?.references.length ?? 0;
      const corners = design.source.corners
        .map((c) => ({ name: c.name, v: c.model?.params.find((x) => x.name === p.name)?.value }))
        .filter((c) => c.v !== undefined && c.v !== p.value)
        .map((c) => `${c.name}: ${valueText(c.v!, p.dimension)}`);
      const head = [
        `**param ${p.name}** = ${valueText(p.value, p.dimension)}`,
        `Used ${uses} time${uses === 1 ? '' : 's'}.` +
          (corners.length ? ` Corners: ${corners.join(', ')}.` : ''),
      ];
      if (p.free) {
        const at =
          p.value <= p.free.low
            ? ' — at its lower bound'
            : p.value >= p.free.high
              ? ' — at its upper bound'
              : '';
        head.push(
          `Free: the solve may move it from ${valueText(p.free.low, p.dimension)} to ${valueText(p.free.high, p.dimension)}${at}.`,
        );
      }
      // What +10 % of this parameter does to the loop, nominal and in the worst corner (exact re-analysis).
      const moved = sensitivities(design.source, design.runs, p.name);
      const worstCorner = design.worst.phaseMarginDeg?.corner;
      const shown = moved.filter((x) => x.corner === 'nominal' || x.corner === worstCorner);
      if (shown.length)
        head.push(
          '',
          `**+${SENSITIVITY_STEP * 100} % of ${p.name}:**`,
          ...shown.map((x) => `- ${sensitivityText(x)}`),
        );
      const model = design.source.nominal;
      const refs =
        design.source.symbols.find((x) => x.kind === 'param' && x.name === p.name)?.references ?? [];
      const nodes = new Set<string>();
      for (const ref of refs) {
        const at = model ? statementAt(model, ref.start) : undefined;
        for (const n of at ? nodesOf(at) : []) nodes.add(n);
      }
      return a && nodes.size ? [...head, '', ...poleLines(a, [...nodes])] : head;
    }
    case 'requirement': {
      const r = requirementAcrossRuns(design, target.item);
      if (!r.runs.length) return [`**require** — not measured (the design could not be analyzed)`];
      const first = r.nominal ?? r.runs[0]!.m;
      const lines = [
        `**requirement: ${first.label}** ${first.required}`,
        `Measured: ${first.measured} — ${first.pass ? 'pass' : 'FAIL'}${first.margin ? ` (headroom ${first.margin})` : ''}`,
        ...(first.detail ? [first.detail[0]!.toUpperCase() + first.detail.slice(1) + '.'] : []),
      ];
      if (r.runs.length > 1) {
        lines.push('', '| corner | measured | |', '| --- | --- | --- |');
        for (const x of r.runs)
          lines.push(`| ${x.corner} | ${x.m.measured} | ${x.m.pass ? 'pass' : 'FAIL'} |`);
        if (r.worst) lines.push('', `Worst corner: ${r.worst.corner} (${r.worst.m.measured})`);
      }
      return lines;
    }
    case 'design': {
      const lines = [`**design ${design.source.name}**`];
      if (!run) return [...lines, 'Not analyzed: see the errors in this design.'];
      const loop = run.analysis.loop;
      lines.push(
        `UGF ${loop.ugfHz !== undefined ? formatSi(loop.ugfHz, 'Hz') : '—'}, phase margin ${loop.phaseMarginDeg !== undefined ? formatDeg(loop.phaseMarginDeg) : '—'}, ` +
          `gain margin ${run.analysis.problems.length > 0 ? NOT_COMPUTED : formatGainMargin(loop.gainMarginDb)}, DC gain ${formatDcGain(run.analysis.dcGain)}`,
        '',
        closedLoopSummary(run.analysis),
      );
      const w = design.worst;
      if (design.runs.length > 1) {
        const parts = [
          w.phaseMarginDeg ? `PM ${formatDeg(w.phaseMarginDeg.value)} (${w.phaseMarginDeg.corner})` : '',
          w.ugfHz ? `UGF ${formatSi(w.ugfHz.value, 'Hz')} (${w.ugfHz.corner})` : '',
        ].filter(Boolean);
        const corners = design.runs.length - 1;
        if (parts.length)
          lines.push(
            `Worst over nominal and ${corners} corner${corners === 1 ? '' : 's'}: ${parts.join(', ')}`,
          );
      }
      const counts = ['error', 'warning', 'info'].map(
        (sev) => [sev, design.findings.filter((f) => f.severity === sev).length] as const,
      );
      lines.push(counts.map(([sev, n]) => `${n} ${sev}${n === 1 ? '' : 's'}`).join(', '));
      return lines;
    }
    case 'feedback': {
      const head = [
        `**feedback at ${target.item.node}**: the loop closed by the circuit, broken where it senses ${target.item.node}`,
      ];
      if (!a) return head;
      return [...head, `Loop: ${feedbackLoopText(a)}`, '', ...closedCircuitLines(a)];
    }
    case 'symbol': {
      const s = target.symbol;
      const supply = a ? supplyText(a, s.name) : undefined;
      if (s.kind === 'node' && supply) return [`**supply ${s.name}**`, `Supply ${supply}`];
      if (s.kind === 'node')
        return a ? [`**node ${s.name}**`, '', ...poleLines(a, [s.name])] : [`**node ${s.name}**`];
      if (s.kind === 'corner') {
        const cr = design.runs.find((x) => x.corner === s.name);
        const loop = cr?.analysis.loop;
        return [
          `**corner ${s.name}**`,
          loop
            ? `UGF ${loop.ugfHz !== undefined ? formatSi(loop.ugfHz, 'Hz') : '—'}, PM ${loop.phaseMarginDeg !== undefined ? formatDeg(loop.phaseMarginDeg) : '—'}`
            : 'not analyzed (its overrides could not be evaluated)',
        ];
      }
      return undefined;
    }
  }
}

export function hover(report: DocumentReport, position: SourcePosition): Hover | null {
  const design = designAt(report, position);
  if (!design) return null;
  const target = targetAt(design, position);
  if (!target) return null;
  const lines = body(design, target);
  if (!lines) return null;
  const errors = report.parsed.diagnostics.filter(
    (d) => d.severity === 'error' && rangeContains(design.source.range, d.range),
  ).length;
  if (errors)
    lines.push(
      '',
      `This design has ${errors} error${errors === 1 ? '' : 's'}: the analysis leaves out what they affect, and the checks wait until they are fixed.`,
    );
  const problems = design.runs.flatMap((r) => r.analysis.problems.map((p) => p.message));
  if (problems.length) lines.push('', `Not analyzed: ${problems[0]}`);
  lines.push('', `_${CAUTION}_`);
  return { contents: { kind: 'markdown', value: lines.join('\n') }, range: toRange(target.range) };
}

// `analyze` without --json: readable tables of the exact results, one block per design.
import { feedbackNode } from '../../shared/src/language/model';
import { closedLoopVerdict } from '../../shared/src/format/closedLoop';
import type {
  ClosedCircuit,
  DesignAnalysis,
  LargeSignalStep,
  Pole,
  Zero,
} from '../../shared/src/analysis/types';
import { closedLoopDcGain } from '../../shared/src/analysis/closedLoopValues';
import { LOAD_STEP_TOLERANCE } from '../../shared/src/analysis/closedCircuit';
import { formatDeg, formatHz, formatSi, roundSignificant } from '../../shared/src/format/si';
import { formatGainMargin } from '../../shared/src/format/quantities';
import { dampingRatio, modulusHz } from '../../shared/src/numeric/complex';
import { CAUTION } from '../../shared/src/protocol/panelData';
import type { Finding } from '../../shared/src/checks/types';
import type { CornerRun, DesignReport, DocumentReport, Worst } from '../../shared/src/report';
import { formatFindingText } from './formatText';
import { dbText, errorText, radText, rootText, slewText } from './display';
import { findingsOfDesign, sortedFindings } from './run';
import { gainDb } from '../../shared/src/units';

const DASH = '—';

export function formatAnalyzeText(
  path: string,
  report: DocumentReport,
  designs: readonly DesignReport[],
): string {
  const blocks = designs.map((d) => designBlock(path, d, findingsOfDesign(report, d.source.name)));
  return [...blocks, wrap(`Note: ${CAUTION}`, 100).join('\n')].join('\n\n') + '\n';
}

function designBlock(path: string, d: DesignReport, findings: readonly Finding[]): string {
  const out: string[] = [];
  const title = `${d.source.name}  (${path}:${d.source.range.start.line + 1})`;
  out.push(title, '═'.repeat(Math.min(100, Math.max(title.length, 40))));
  if (d.runs.length === 0) {
    out.push('  not analyzed: the design could not be evaluated (see findings)');
  } else {
    out.push(...table(['', ...d.runs.map((r) => r.corner)], metricRows(d.runs)).map((l) => '  ' + l));
    for (const run of d.runs) out.push('', ...rootsBlock(run));
    const worst = worstLine(d);
    if (worst) out.push('', `  worst case: ${worst}`);
  }
  const unevaluated = d.source.corners
    .filter((c) => !d.runs.some((r) => r.corner === c.name))
    .map((c) => c.name);
  if (unevaluated.length > 0)
    out.push(`  not evaluated: corner${unevaluated.length > 1 ? 's' : ''} ${unevaluated.join(', ')}`);
  out.push('');
  if (findings.length === 0) out.push('  findings: none');
  else {
    out.push(`  findings (${findings.length})`);
    for (const f of sortedFindings(findings)) out.push(...formatFindingText(path, f).map((l) => '    ' + l));
  }
  return out.join('\n');
}

function metricRows(runs: readonly CornerRun[]): string[][] {
  const row = (label: string, f: (a: DesignAnalysis) => string) => [
    label,
    ...runs.map((r) => (r.analysis.problems.length > 0 ? 'not solved' : f(r.analysis))),
  ];
  const opt = <T>(x: T | undefined, show: (v: T) => string) => (x === undefined ? DASH : show(x));
  const tol = runs[0]?.analysis.step?.tolerance;
  const circuit = runs[0] && feedbackNode(runs[0].model);
  return [
    ...(circuit
      ? [
          row(
            `loop broken at ${circuit.node}, T(0)`,
            (a) => `${dbText(gainDb(a.dcGain))}  (${formatSi(a.dcGain, 'V/V')})`,
          ),
        ]
      : [
          row('open-loop DC gain', (a) => `${dbText(gainDb(a.dcGain))}  (${formatSi(a.dcGain, 'V/V')})`),
          row('open-loop UGF', (a) => opt(a.openLoopUgfHz, formatHz)),
        ]),
    ...(circuit ? [] : [row('loop DC gain', (a) => dbText(gainDb(a.loop.dcGain)))]),
    row('loop UGF', (a) => opt(a.loop.ugfHz, formatHz)),
    row('phase margin', (a) => opt(a.loop.phaseMarginDeg, formatDeg)),
    row('gain margin', (a) => formatGainMargin(a.loop.gainMarginDb)),
    row('unity crossings', (a) =>
      a.loop.crossings.length === 0
        ? DASH
        : a.loop.crossings.map((c) => `${c.direction === 'down' ? '↓' : '↑'}${formatHz(c.hz)}`).join(' '),
    ),
    row('closed loop', (a) => closedLoopVerdict(a)),
    row('closed-loop DC gain', (a) => {
      const g = closedLoopDcGain(a);
      return g === undefined ? DASH : `${dbText(gainDb(g))}  (${formatSi(g, 'V/V')})`;
    }),
    row('closed-loop bandwidth', (a) => opt(a.closedLoopBandwidthHz, formatHz)),
    ...circuitRows(runs),
    row('closed-loop peaking', (a) =>
      a.stability && a.stability.verdict !== 'stable' ? DASH : dbText(a.loop.peakingDb),
    ),
    row('slew rate', (a) => opt(a.slew?.rate, slewText)),
    row(`settling${tol !== undefined ? ` (±${roundSignificant(tol * 100)} %)` : ''}`, (a) =>
      a.step
        ? opt(a.step.settlingTime, (t) => formatSi(t, 's')) +
          (a.step.tolerance !== tol ? ` (±${roundSignificant(a.step.tolerance * 100)} %)` : '')
        : DASH,
    ),
    row('overshoot', (a) =>
      a.step && a.stability?.verdict !== 'unstable' ? `${roundSignificant(a.step.overshootPct)} %` : DASH,
    ),
    ...largeSignalRows(runs),
  ];
}

/** A loop written as a circuit: its output impedance, load step and supply rejection. */
function circuitRows(runs: readonly CornerRun[]): string[][] {
  const first = runs.find((r) => r.analysis.closedCircuit)?.analysis.closedCircuit;
  if (!first) return [];
  const row = (label: string, f: (c: ClosedCircuit) => string) => [
    label,
    ...runs.map((r) =>
      r.analysis.problems.length > 0
        ? 'not solved'
        : r.analysis.closedCircuit
          ? f(r.analysis.closedCircuit)
          : DASH,
    ),
  ];
  return [
    row('output impedance at DC', (c) => formatSi(Math.abs(c.outputImpedance.dcOhm), 'ohm')),
    row(
      '  peak',
      (c) => `${formatSi(c.outputImpedance.peakOhm, 'ohm')} at ${formatHz(c.outputImpedance.peakHz)}`,
    ),
    row('load step, per A', (c) => (c.loadStep ? `peak ${formatSi(c.loadStep.peakDeviation, 'V')}` : DASH)),
    row(`  recovers (±${roundSignificant(LOAD_STEP_TOLERANCE * 100)} % of peak)`, (c) =>
      c.loadStep?.settlingTime !== undefined ? formatSi(c.loadStep.settlingTime, 's') : DASH,
    ),
    ...first.supplies.flatMap((s, i) => [
      row(`supply rejection, ${s.node}, DC`, (c) => opt2(c.supplies[i]?.dcDb, dbText)),
      row('  worst', (c) => {
        const x = c.supplies[i];
        return x ? `${dbText(x.worstDb)} at ${formatHz(x.worstHz)}` : DASH;
      }),
    ]),
  ];
}

const opt2 = <T>(x: T | undefined, show: (v: T) => string) => (x === undefined ? DASH : show(x));

/** The large-signal step's rows, when a `settle … step` requirement asks for it. */
function largeSignalRows(runs: readonly CornerRun[]): string[][] {
  const first = runs.find((r) => r.analysis.largeSignalStep)?.analysis.largeSignalStep;
  if (!first) return [];
  const cell = (r: CornerRun, f: (l: LargeSignalStep) => string) => {
    const l = r.analysis.largeSignalStep;
    return r.analysis.problems.length > 0 ? 'not solved' : l ? f(l) : DASH;
  };
  const row = (label: string, f: (l: LargeSignalStep) => string) => [label, ...runs.map((r) => cell(r, f))];
  return [
    row(
      `settling, ${formatSi(first.amplitude, 'V')} step (±${roundSignificant(first.tolerance * 100)} %)`,
      (l) => (l.settlingTime !== undefined ? formatSi(l.settlingTime, 's') : 'does not settle'),
    ),
    row('  of which slewing', (l) => formatSi(l.slewingTime, 's')),
    row('  slew rate reached', (l) => slewText(l.slewRateReached)),
    row('  limiting stage', (l) => l.limitingStage ?? 'none slews'),
    row('  overshoot', (l) => `${roundSignificant(l.overshootPct)} %`),
  ];
}

function rootsBlock(run: CornerRun): string[] {
  const a = run.analysis;
  const out = [`  ${run.corner}`];
  if (a.problems.length > 0) {
    for (const p of a.problems) out.push(`    not solved: ${p.message}${p.node ? ` (node ${p.node})` : ''}`);
    return out;
  }
  const rows: string[][] = [];
  // For a loop written as a circuit, the open loop is the loop gain at the break.
  const open = a.closedCircuit ? `loop-gain poles (broken at ${a.closedCircuit.feedbackNode})` : 'poles';
  const openZeros = a.closedCircuit ? 'loop-gain zeros' : 'zeros';
  a.poles.forEach((p, i) => rows.push([i === 0 ? open : '', ...poleCells(p)]));
  if (a.poles.length === 0) rows.push([open, 'none', '', '', '']);
  a.zeros.forEach((z, i) => rows.push([i === 0 ? openZeros : '', ...zeroCells(z)]));
  if (a.zeros.length === 0) rows.push([openZeros, 'none (finite)', '', '', '']);
  // The closed loop's poles decide stability; shown beside the open loop's, upper half of each pair. A
  // circuit's own poles carry their participation.
  if (a.closedCircuit) {
    a.closedCircuit.poles
      .filter((p) => p.s.im >= 0)
      .forEach((p, i) => {
        const cells = poleCells(p);
        if (p.s.re > 0) cells[3] = `${cells[3]}; right half-plane: unstable`;
        // docs/analysis.md, Held charge: a node reached only through capacitors keeps its charge.
        if (p.s.re === 0 && p.s.im === 0) cells[3] = `${cells[3]}; held charge (set by a reset), not a drift`;
        rows.push([i === 0 ? 'closed-circuit poles' : '', ...cells]);
      });
  } else
    (a.closedLoopPoles ?? [])
      .filter((p) => p.im >= 0)
      .forEach((p, i) => {
        rows.push([
          i === 0 ? 'closed-loop poles' : '',
          rootText(p.re, p.im),
          formatHz(modulusHz(p)),
          roundSignificant(dampingRatio(p), 3).toString(),
          p.re > 0 ? 'right half-plane: unstable' : '',
        ]);
      });
  out.push(...table(['', 's / 2π', '|s| / 2π', 'ζ', 'where'], rows).map((l) => '    ' + l));
  const hand = a.hand ?? [];
  if (hand.length > 0) {
    const hrows = hand.map((h) => [
      h.quantity,
      h.formula,
      radText(h.hand),
      radText(h.exact),
      errorText(h.relativeError),
    ]);
    out.push(
      '',
      ...table(['hand estimate', 'formula', 'hand', 'exact', 'error'], hrows).map((l) => '    ' + l),
    );
  }
  if (a.slew && a.slew.limits.length > 1) {
    const srows = a.slew.limits.map((l) => [
      l.stage,
      formatSi(l.current, 'A'),
      formatSi(l.cap, 'F'),
      slewText(l.rate),
    ]);
    out.push('', ...table(['slew limit', 'current', 'capacitance', 'rate'], srows).map((l) => '    ' + l));
  }
  return out;
}

function poleCells(p: Pole): string[] {
  const where =
    p.namedAfter === 'shared'
      ? 'shared: ' +
        p.participation
          .filter((x) => x.share >= 0.005)
          .slice(0, 3)
          .map(share)
          .join(', ')
      : `${p.namedAfter} ${pct(p.participation[0]?.share ?? 1)}`;
  return [rootText(p.s.re, p.s.im), formatHz(p.hz), roundSignificant(p.damping, 3).toString(), where];
}

function zeroCells(z: Zero): string[] {
  return [rootText(z.s.re, z.s.im), formatHz(z.hz), '', z.rhp ? 'right half-plane' : 'left half-plane'];
}

const share = (x: { node: string; share: number }) => `${x.node} ${pct(x.share)}`;
const pct = (x: number) => `${Math.round(x * 100)} %`;

function worstLine(d: DesignReport): string {
  const w = d.worst;
  const parts: string[] = [];
  const add = (label: string, x: Worst | undefined, show: (v: number) => string) => {
    if (x) parts.push(`${label} ${show(x.value)} (${x.corner})`);
  };
  add('phase margin', w.phaseMarginDeg, formatDeg);
  add('UGF', w.ugfHz, formatHz);
  add('gain margin', w.gainMarginDb, dbText);
  add('slew', w.slew, slewText);
  add('settling', w.settlingTime, (t) => formatSi(t, 's'));
  add('DC gain', w.dcGainDb, dbText);
  return parts.join(', ');
}

/** Left-aligned columns separated by two spaces; the header row is underlined. */
export function table(header: readonly string[], rows: readonly (readonly string[])[]): string[] {
  const all = [header, ...rows];
  const widths = header.map((_, c) => Math.max(...all.map((r) => [...(r[c] ?? '')].length)));
  const line = (r: readonly string[]) =>
    r
      .map((cell, c) => cell.padEnd(widths[c]! + (cell.length - [...cell].length)))
      .join('  ')
      .trimEnd();
  return [
    line(header),
    widths
      .map((w) => (w === 0 ? '' : '─'.repeat(w)))
      .join('  ')
      .trimEnd(),
    ...rows.map(line),
  ];
}

function wrap(text: string, width: number): string[] {
  const lines: string[] = [];
  let cur = '';
  for (const word of text.split(/\s+/)) {
    if (cur.length + word.length + 1 > width && cur) {
      lines.push(cur);
      cur = word;
    } else cur = cur ? `${cur} ${word}` : word;
  }
  if (cur) lines.push(cur);
  return lines;
}

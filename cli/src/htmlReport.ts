// `ampnote report`: one self-contained HTML page. Everything the page needs is inside it (styles, the chart
// bundle, the data); a content security policy with hashes of exactly those inline blocks forbids every
// network load, so the page opens the same offline, from an archive or attached to a review.
import { createHash } from 'node:crypto';
import type { Finding, Severity } from '../../shared/src/checks/types';
import { formatDeg, formatHz, formatSi, roundSignificant } from '../../shared/src/format/si';
import { formatGainMargin } from '../../shared/src/format/quantities';
import { CHARTS } from '../../shared/src/charts/descriptors';
import { CAUTION, type PanelData, type PanelSweep } from '../../shared/src/protocol/panelData';
import { chartAbsent } from '../../shared/src/charts/presence';
import { sweptText } from '../../shared/src/charts/sweepCharts';
import type { DesignAnalysis } from '../../shared/src/analysis/types';
import type { CornerRun, DesignReport, Worst } from '../../shared/src/report';
import { dbText, errorText, radText, rootText, slewText } from './display';
import { sortedFindings } from './run';
import { gainDb } from '../../shared/src/units';

export interface ReportDesign {
  readonly report: DesignReport;
  /** The design's findings as the document lists them (language diagnostics and checks). */
  readonly findings: readonly Finding[];
  /** Chart data for the nominal model; absent when the design could not be evaluated. */
  readonly panel?: PanelData;
}

export interface ReportInput {
  readonly file: string;
  readonly version: string;
  /** ISO time of generation, shown in the header. */
  readonly generated: string;
  readonly designs: readonly ReportDesign[];
  /** Findings outside every design. */
  readonly fileFindings: readonly Finding[];
  /** The chart script (defines the global `AmpnoteCharts` with `drawCharts`; see chartsScript.ts). */
  readonly chartsScript: string;
}

/** Text for HTML content and attribute values: everything the user wrote passes through here. */
export function escapeHtml(s: string): string {
  return s.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!,
  );
}

/** JSON inside <script type="application/json">: no `<` at all, so no `</script>` or `<!--` can end it early. */
export function embedJson(value: unknown): string {
  return JSON.stringify(value)
    .replace(/</g, '\\u003c')
    .replace(/\u2028/g, '\\u2028')
    .replace(/\u2029/g, '\\u2029');
}

/**
 * A script's text made safe inside <script>…</script>: the HTML parser ends a script at `</script` whatever
 * the JavaScript around it, and `<!--` changes how it looks for that end. Both only occur inside string or
 * regular-expression literals in real code, where `<\/` and `<\!` mean the same characters. The source-map
 * comment is dropped: it names a file beside the bundle, which a self-contained page must not refer to.
 */
export function inlineScript(code: string): string {
  return code
    .replace(/^\/\/# sourceMappingURL=.*$/gm, '')
    .replace(/<\/(script)/gi, '<\\/$1')
    .replace(/<!--/g, '<\\!--');
}

export function renderReport(input: ReportInput): string {
  const data = {
    file: input.file,
    designs: input.designs.map((d) => ({ name: d.report.source.name, panel: d.panel ?? null })),
  };
  const script = inlineScript(input.chartsScript);
  const css = STYLE;
  const hash = (s: string) => `'sha256-${createHash('sha256').update(s, 'utf8').digest('base64')}'`;
  const csp = [
    "default-src 'none'",
    `script-src ${hash(script)} ${hash(PAGE_SCRIPT)}`,
    `style-src ${hash(css)}`,
    'img-src data:',
    "base-uri 'none'",
    "form-action 'none'",
  ].join('; ');

  const errors = count(input, 'error');
  const warnings = count(input, 'warning');
  const body = [
    `<header class="top">`,
    `<p class="kicker">Ampnote design report</p>`,
    `<h1>${escapeHtml(input.file)}</h1>`,
    `<p class="meta">${plural(input.designs.length, 'design')} · ${plural(errors, 'error')} · ${plural(warnings, 'warning')} · generated ${escapeHtml(input.generated)} by ampnote ${escapeHtml(input.version)}</p>`,
    `</header>`,
    `<aside class="caution" role="note"><strong>Caution.</strong> ${escapeHtml(CAUTION)}</aside>`,
    input.designs.length > 1 ? contents(input.designs) : '',
    input.fileFindings.length > 0
      ? `<section class="design"><h2>Outside any design</h2>${findingsList(input.fileFindings)}</section>`
      : '',
    ...input.designs.map((d, i) => designSection(d, i)),
    `<footer><p>${escapeHtml(CAUTION)}</p><p>Written by ampnote ${escapeHtml(input.version)} from ${escapeHtml(input.file)}.</p></footer>`,
  ].join('\n');

  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${escapeHtml(csp)}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<link rel="icon" href="data:,">
<meta name="generator" content="ampnote ${escapeHtml(input.version)}">
<title>${escapeHtml(input.file)} — Ampnote design report</title>
<style>${css}</style>
</head>
<body>
<main>
${body}
</main>
<script type="application/json" id="ampnote-data">${embedJson(data)}</script>
<script>${script}</script>
<script>${PAGE_SCRIPT}</script>
</body>
</html>
`;
}

/** `cl from 1 pF to 1 nF`: which sweep a chart shows. */
function sweepRangeText(sw: PanelSweep): string {
  return `${sw.param} from ${sweptText(sw, sw.values[0]!)} to ${sweptText(sw, sw.values.at(-1)!)}`;
}

function count(input: ReportInput, severity: Severity): number {
  return [...input.fileFindings, ...input.designs.flatMap((d) => d.findings)].filter(
    (f) => f.severity === severity,
  ).length;
}

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;

function contents(designs: readonly ReportDesign[]): string {
  const items = designs.map((d, i) => {
    const e = d.findings.filter((f) => f.severity === 'error').length;
    const w = d.findings.filter((f) => f.severity === 'warning').length;
    const status =
      e > 0
        ? `<span class="chip error">${plural(e, 'error')}</span>`
        : w > 0
          ? `<span class="chip warning">${plural(w, 'warning')}</span>`
          : `<span class="chip ok">no findings</span>`;
    return `<li><a href="#design-${i}">${escapeHtml(d.report.source.name)}</a> ${status}</li>`;
  });
  return `<nav class="contents"><h2>Designs</h2><ul>${items.join('')}</ul></nav>`;
}

function designSection(d: ReportDesign, index: number): string {
  const r = d.report;
  const nominal = r.runs[0];
  const parts: string[] = [];
  parts.push(
    `<section class="design" id="design-${index}" data-design-index="${index}">`,
    `<h2><span class="label">design</span> ${escapeHtml(r.source.name)}</h2>`,
    `<p class="where">${whereLine(r)}</p>`,
  );
  if (!nominal) {
    parts.push(
      `<p class="problem">This design could not be evaluated; see its findings.</p>`,
      findingsList(d.findings),
      `</section>`,
    );
    return parts.join('\n');
  }
  const solved = r.runs.filter((run) => run.analysis.problems.length === 0);
  if (nominal.analysis.problems.length === 0) parts.push(keyValues(nominal.analysis, r));
  // A table of nothing but "not solved" says less than the reason, which the roots section gives.
  if (solved.length > 0) parts.push(cornerTable(r.runs));
  else parts.push(rootsTable(nominal));
  parts.push(
    `<h3>Findings</h3>`,
    d.findings.length > 0 ? findingsList(d.findings) : `<p class="none">No findings.</p>`,
  );
  if (solved.length > 0)
    parts.push(rootsTable(nominal), cornerRoots(r.runs.slice(1)), handTable(nominal.analysis));
  parts.push(`<h3>Charts <span class="sub">nominal</span></h3>`);
  if (!d.panel) parts.push(`<p class="problem">No chart data for this design.</p>`);
  else if (d.panel.problems.length > 0) {
    parts.push(`<p class="problem">Charts not drawn: ${d.panel.problems.map(escapeHtml).join('; ')}</p>`);
  } else {
    const panel = d.panel;
    const figure = (c: (typeof CHARTS)[number], note: string, sweep?: number, extraClass = '') =>
      `<figure class="chart${extraClass}"><figcaption><strong>${escapeHtml(c.title)}</strong> ${escapeHtml(note)}</figcaption><div class="canvas-box"><canvas data-chart="${c.id}"${sweep !== undefined ? ` data-sweep="${sweep}"` : ''} role="img" aria-label="${escapeHtml(c.title)} of ${escapeHtml(r.source.name)}"></canvas></div></figure>`;
    // Each sweep after the first has its own pair of sweep charts (the first is drawn with the others).
    const sweepCharts = CHARTS.filter((c) => 'perSweep' in c && c.perSweep);
    const laterSweeps = (panel.sweeps ?? [])
      .slice(1)
      .flatMap((sw, k) => sweepCharts.map((c) => figure(c, `${sweepRangeText(sw)}. ${c.shows}`, k + 1)));
    parts.push(
      `<div class="charts">`,
      ...CHARTS.filter((c) => !chartAbsent(c.id, panel)).map((c) => {
        // Without a compensation capacitor there is nothing to sweep: say so instead of showing empty axes.
        // (The drawing code still draws into the hidden canvas; it draws all the charts together.)
        const noSweep = c.id === 'locus' && !panel.compensation;
        const first = panel.sweeps?.[0];
        const note = noSweep
          ? 'This design has no compensation capacitor, so there is no pole split to show.'
          : 'perSweep' in c && c.perSweep && first
            ? `${sweepRangeText(first)}. ${c.shows}`
            : c.shows;
        return figure(c, note, undefined, noSweep ? ' no-sweep' : '');
      }),
      ...laterSweeps,
      `</div>`,
      `<noscript><p class="problem">The charts need JavaScript; the tables above hold the same values.</p></noscript>`,
    );
  }
  parts.push(`</section>`);
  return parts.join('\n');
}

/** Where the design is, which corners were analyzed, and which could not be evaluated. */
function whereLine(r: DesignReport): string {
  const parts = [`line ${r.source.range.start.line + 1}`];
  if (r.runs.length > 1) parts.push(`nominal and ${plural(r.runs.length - 1, 'corner')}`);
  const skipped = r.source.corners
    .filter((c) => !r.runs.some((run) => run.corner === c.name))
    .map((c) => c.name);
  if (skipped.length > 0) {
    parts.push(`not evaluated: corner${skipped.length > 1 ? 's' : ''} ${skipped.map(escapeHtml).join(', ')}`);
  }
  return parts.join(' · ');
}

function keyValues(a: DesignAnalysis, r: DesignReport): string {
  const worst = (w: Worst | undefined, show: (v: number) => string) =>
    w && r.runs.length > 1
      ? `<span class="worst">worst ${escapeHtml(show(w.value))} · ${escapeHtml(w.corner)}</span>`
      : '';
  const tiles: [string, string, string][] = [
    ['Unity-gain frequency', opt(a.loop.ugfHz, formatHz), worst(r.worst.ugfHz, formatHz)],
    ['Phase margin', opt(a.loop.phaseMarginDeg, formatDeg), worst(r.worst.phaseMarginDeg, formatDeg)],
    ['Gain margin', formatGainMargin(a.loop.gainMarginDb), worst(r.worst.gainMarginDb, dbText)],
    ['Open-loop DC gain', dbText(gainDb(a.dcGain)), worst(r.worst.dcGainDb, dbText)],
    ['Slew rate', opt(a.slew?.rate, slewText), worst(r.worst.slew, slewText)],
    [
      a.step ? `Settling to ±${roundSignificant(a.step.tolerance * 100)} %` : 'Settling',
      opt(a.step?.settlingTime, (t) => formatSi(t, 's')),
      worst(r.worst.settlingTime, (t) => formatSi(t, 's')),
    ],
  ];
  return `<dl class="tiles">${tiles
    .map(([k, v, w]) => `<div><dt>${escapeHtml(k)}</dt><dd>${escapeHtml(v)}</dd>${w}</div>`)
    .join('')}</dl>`;
}

function cornerTable(runs: readonly CornerRun[]): string {
  const rows: [string, (a: DesignAnalysis) => string][] = [
    ['loop UGF', (a) => opt(a.loop.ugfHz, formatHz)],
    ['phase margin', (a) => opt(a.loop.phaseMarginDeg, formatDeg)],
    ['gain margin', (a) => formatGainMargin(a.loop.gainMarginDb)],
    [
      'unity crossings',
      (a) =>
        a.loop.crossings.length === 0
          ? '—'
          : a.loop.crossings.map((c) => `${c.direction === 'down' ? '↓' : '↑'} ${formatHz(c.hz)}`).join(', '),
    ],
    ['closed-loop peaking', (a) => dbText(a.loop.peakingDb)],
    ['open-loop DC gain', (a) => dbText(gainDb(a.dcGain))],
    ['open-loop UGF', (a) => opt(a.openLoopUgfHz, formatHz)],
    ['slew rate', (a) => opt(a.slew?.rate, slewText)],
    ['settling', (a) => (a.step ? opt(a.step.settlingTime, (t) => formatSi(t, 's')) : '—')],
    ['overshoot', (a) => (a.step ? `${roundSignificant(a.step.overshootPct)} %` : '—')],
    ['poles', (a) => String(a.poles.length)],
  ];
  const head = `<tr><th></th>${runs.map((r) => `<th>${escapeHtml(r.corner)}</th>`).join('')}</tr>`;
  const body = rows
    .map(
      ([label, f]) =>
        `<tr><th>${label}</th>${runs.map((r) => `<td>${escapeHtml(r.analysis.problems.length > 0 ? 'not solved' : f(r.analysis))}</td>`).join('')}</tr>`,
    )
    .join('');
  return `<div class="scroll"><table class="corners"><thead>${head}</thead><tbody>${body}</tbody></table></div>`;
}

function rootsTable(run: CornerRun): string {
  if (run.analysis.problems.length > 0) return rootsBody(run, 'roots');
  return `<h3>Poles and zeros <span class="sub">nominal</span></h3>${rootsBody(run, 'roots')}`;
}

/** The other corners' roots, folded: the nominal table above is what most readers want first. */
function cornerRoots(runs: readonly CornerRun[]): string {
  return runs
    .map(
      (run) =>
        `<details class="corner-roots"><summary>Poles and zeros in corner <strong>${escapeHtml(run.corner)}</strong></summary>${rootsBody(run, 'roots-corner')}</details>`,
    )
    .join('');
}

function rootsBody(run: CornerRun, className: string): string {
  const a = run.analysis;
  if (a.problems.length > 0) {
    return `<p class="problem">Not solved: ${a.problems.map((p) => escapeHtml(p.message + (p.node ? ` (node ${p.node})` : ''))).join('; ')}</p>`;
  }
  const poleRows = a.poles.map((p, i) => {
    const bars = p.participation
      .filter((x) => x.share >= 0.005)
      .slice(0, 4)
      .map(
        (x) =>
          `<span class="share"><span class="bar" data-share="${roundSignificant(x.share, 3)}"><i class="w${Math.round(x.share * 20) * 5}"></i></span>${escapeHtml(x.node)} ${Math.round(x.share * 100)} %</span>`,
      )
      .join('');
    const named = p.namedAfter === 'shared' ? '<em>shared</em>' : escapeHtml(p.namedAfter);
    return `<tr><td>p${i + 1}</td><td>${escapeHtml(rootText(p.s.re, p.s.im))}</td><td>${escapeHtml(formatHz(p.hz))}</td><td>${roundSignificant(p.damping, 3)}</td><td>${named}</td><td class="shares">${bars}</td></tr>`;
  });
  const zeroRows = a.zeros.map(
    (z, i) =>
      `<tr><td>z${i + 1}</td><td>${escapeHtml(rootText(z.s.re, z.s.im))}</td><td>${escapeHtml(formatHz(z.hz))}</td><td></td><td>${z.rhp ? '<span class="chip error">right half-plane</span>' : 'left half-plane'}</td><td></td></tr>`,
  );
  return `<div class="scroll"><table class="${className}"><thead><tr><th></th><th>s / 2π</th><th>|s| / 2π</th><th>ζ</th><th>named after</th><th>node participation</th></tr></thead><tbody>${[...poleRows, ...zeroRows].join('')}</tbody></table></div>`;
}

function handTable(a: DesignAnalysis): string {
  const hand = a.hand ?? [];
  if (hand.length === 0) return '';
  const rows = hand.map(
    (h) =>
      `<tr><td>${escapeHtml(h.quantity)}</td><td><code>${escapeHtml(h.formula)}</code></td><td>${escapeHtml(radText(h.hand))}</td><td>${escapeHtml(radText(h.exact))}</td><td>${errorText(h.relativeError)}</td></tr>`,
  );
  return `<h3>Hand estimates against the exact roots <span class="sub">nominal</span></h3><div class="scroll"><table><thead><tr><th>quantity</th><th>formula</th><th>hand</th><th>exact</th><th>error</th></tr></thead><tbody>${rows.join('')}</tbody></table></div>`;
}

function findingsList(findings: readonly Finding[]): string {
  const items = sortedFindings(findings).map((f) => {
    const at = `${f.range.start.line + 1}:${f.range.start.character + 1}`;
    const corners =
      f.corners && f.corners.length > 0
        ? ` <span class="corners-of">${f.corners.map(escapeHtml).join(', ')}</span>`
        : '';
    const related = f.related
      .map(
        (x) =>
          `<li><span class="at">${x.range.start.line + 1}:${x.range.start.character + 1}</span> ${escapeHtml(x.message)}</li>`,
      )
      .join('');
    const fixes = f.fixes
      .map((x) => `<li>${x.preferred ? '<strong>preferred:</strong> ' : ''}${escapeHtml(x.title)}</li>`)
      .join('');
    return `<li class="finding ${f.severity}"><div class="head"><span class="sev">${f.severity}</span><code class="code">${f.code}</code><span class="at">line ${at}</span>${corners}</div><p>${escapeHtml(f.message)}</p>${related ? `<ul class="related">${related}</ul>` : ''}${fixes ? `<ul class="fixes">${fixes}</ul>` : ''}</li>`;
  });
  return `<ul class="findings">${items.join('')}</ul>`;
}

const opt = <T>(x: T | undefined, show: (v: T) => string) => (x === undefined ? '—' : show(x));

/** Width classes for the participation bars: styles are hashed, so no inline style attributes. */
const BAR_WIDTHS = Array.from({ length: 21 }, (_, i) => `.bar i.w${i * 5}{width:${i * 5}%}`).join('');

const STYLE = `
:root{--paper:#fbfaf7;--ink:#1c2330;--soft:#5b6472;--rule:#e3e0d8;--accent:#0f6e6e;--tile:#ffffff;
--error:#b3261e;--warning:#9a5700;--info:#2f5d9b;--ok:#2e6b3a;color-scheme:light}
*{box-sizing:border-box}
html{background:var(--paper);color:var(--ink);font:15px/1.5 system-ui,-apple-system,"Segoe UI",sans-serif}
body{margin:0}
main{max-width:1180px;margin:0 auto;padding:28px 28px 60px}
h1{margin:2px 0 4px;font-size:1.7rem;font-weight:650;overflow-wrap:anywhere}
h2{margin:0 0 2px;font-size:1.35rem;font-weight:650;overflow-wrap:anywhere}
h3{margin:26px 0 8px;font-size:1rem;font-weight:650;letter-spacing:.01em}
.sub,.label{font-weight:400;color:var(--soft);font-size:.85em}
.kicker{margin:0;text-transform:uppercase;letter-spacing:.14em;font-size:.75rem;color:var(--accent);font-weight:700}
.meta,.where{margin:0;color:var(--soft)}
.top{border-bottom:3px solid var(--ink);padding-bottom:14px}
.caution{margin:18px 0;padding:10px 14px;border-left:4px solid var(--warning);background:#fff6e6}
.contents ul{list-style:none;padding:0;margin:6px 0 0;display:flex;flex-wrap:wrap;gap:8px 22px}
.contents a{color:var(--accent);font-weight:600}
.design{margin-top:34px;padding-top:18px;border-top:1px solid var(--rule)}
.tiles{display:grid;grid-template-columns:repeat(auto-fill,minmax(170px,1fr));gap:10px;margin:16px 0 8px}
.tiles div{background:var(--tile);border:1px solid var(--rule);border-radius:6px;padding:10px 12px}
.tiles dt{font-size:.78rem;color:var(--soft)}
.tiles dd{margin:2px 0 0;font-size:1.3rem;font-weight:650;font-variant-numeric:tabular-nums}
.worst{display:block;font-size:.78rem;color:var(--soft)}
.scroll{overflow-x:auto}
table{border-collapse:collapse;font-variant-numeric:tabular-nums;margin:6px 0;min-width:50%}
th,td{text-align:left;padding:5px 12px 5px 0;border-bottom:1px solid var(--rule);vertical-align:top;white-space:nowrap}
thead th{font-size:.78rem;color:var(--soft);font-weight:600;text-transform:uppercase;letter-spacing:.05em}
tbody th{font-weight:500;color:var(--soft)}
td.shares{white-space:normal}
.share{display:inline-flex;align-items:center;gap:6px;margin-right:14px;font-size:.85rem}
.bar{display:inline-block;width:54px;height:7px;background:var(--rule);border-radius:4px;overflow:hidden}
.bar i{display:block;height:100%;background:var(--accent)}
${BAR_WIDTHS}
.findings{list-style:none;padding:0;margin:0}
.finding{border-left:4px solid var(--info);background:var(--tile);padding:8px 12px;margin:0 0 8px;border-radius:0 6px 6px 0}
.finding.error{border-color:var(--error)}.finding.warning{border-color:var(--warning)}
.finding p{margin:4px 0 0}
.finding .head{display:flex;flex-wrap:wrap;gap:4px 12px;align-items:baseline;font-size:.85rem}
.sev{font-weight:700;text-transform:uppercase;letter-spacing:.06em;font-size:.72rem}
.error .sev{color:var(--error)}.warning .sev{color:var(--warning)}.info .sev{color:var(--info)}
.code{color:var(--accent)}
.at,.corners-of{color:var(--soft)}
.related,.fixes{margin:6px 0 0;padding-left:18px;font-size:.88rem}
.fixes{list-style:"→ "}
.chip{display:inline-block;font-size:.72rem;padding:1px 8px;border-radius:10px;border:1px solid currentColor}
.chip.error{color:var(--error)}.chip.warning{color:var(--warning)}.chip.ok{color:var(--ok)}
.none{color:var(--soft)}
.problem{color:var(--error)}
.charts{display:grid;grid-template-columns:repeat(auto-fit,minmax(480px,1fr));gap:16px}
.chart{margin:0;background:#fff;border:1px solid var(--rule);border-radius:6px;padding:10px 12px 12px}
.chart figcaption{font-size:.85rem;color:var(--soft);margin-bottom:6px}
.chart figcaption strong{color:var(--ink);margin-right:6px}
.canvas-box{position:relative;height:300px}
.corner-roots{margin:6px 0}.corner-roots summary{cursor:pointer;color:var(--soft);font-size:.9rem}
.no-sweep{order:9;grid-column:1/-1}.no-sweep .canvas-box{display:none}
.chart-error{color:var(--error);font-size:.85rem}
footer{margin-top:48px;border-top:1px solid var(--rule);color:var(--soft);font-size:.85rem}
code{font-family:ui-monospace,"SF Mono",Menlo,Consolas,monospace;font-size:.9em}
@media print{main{max-width:none;padding:0}.design{break-before:page}.chart{break-inside:avoid}}
`;

/**
 * Draws each design's charts with the inlined bundle. Canvases are given the ids the drawing code looks
 * for only while it draws, then made unique per design. `window.ampnoteReport` lists what was drawn.
 */
const PAGE_SCRIPT = `(function () {
  var data = JSON.parse(document.getElementById('ampnote-data').textContent);
  var colors = {
    foreground: '#1c2330', muted: '#5b6472', grid: 'rgba(28, 35, 48, 0.12)', background: '#ffffff',
    series: ['#0f6e6e', '#c2571a', '#5a4fb3', '#2e6b3a', '#9a2f6d'],
    zero: '#b3261e', marker: '#1c2330', band: 'rgba(46, 107, 58, 0.55)',
    fontFamily: 'system-ui, -apple-system, "Segoe UI", sans-serif', fontSize: 12
  };
  var report = { drawn: [], failed: [] };
  window.ampnoteReport = report;
  data.designs.forEach(function (d, i) {
    var section = document.querySelector('[data-design-index="' + i + '"]');
    var root = section && section.querySelector('.charts');
    if (!root || !d.panel) return;
    var canvases = root.querySelectorAll('canvas[data-chart]:not([data-sweep])');
    canvases.forEach(function (c) { c.id = 'chart-' + c.getAttribute('data-chart'); });
    try {
      var set = window.AmpnoteCharts.drawCharts(root, d.panel, { colors: colors });
      report.drawn.push({ design: d.name, charts: set });
      // A design's later sweeps: one chart at a time, into their own canvases.
      root.querySelectorAll('canvas[data-sweep]').forEach(function (c) {
        var sweep = Number(c.getAttribute('data-sweep'));
        var chart = window.AmpnoteCharts.drawChart(c, c.getAttribute('data-chart'), d.panel, { colors: colors, sweep: sweep });
        report.drawn.push({ design: d.name, sweep: sweep, charts: { [c.getAttribute('data-chart')]: chart } });
      });
    } catch (err) {
      report.failed.push({ design: d.name, message: String(err && err.message || err) });
      var p = document.createElement('p');
      p.className = 'chart-error';
      p.textContent = 'Charts could not be drawn: ' + (err && err.message || err);
      root.parentNode.insertBefore(p, root);
    }
    canvases.forEach(function (c) { c.id = 'chart-' + c.getAttribute('data-chart') + '-' + i; });
  });
  document.documentElement.setAttribute('data-charts', report.failed.length ? 'failed' : 'drawn');
})();`;

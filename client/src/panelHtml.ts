// The panel's page. Pure, so tests render exactly what the editor shows: a strict policy that admits only
// the extension's own script (by nonce) and stylesheet, and static markup the script fills with text.
import { CAUTION } from '../../shared/src/protocol/panelData';
import { CHARTS } from '../../shared/src/charts/descriptors';

export interface PanelHtmlInput {
  readonly nonce: string;
  /** The webview's resource origin (`webview.cspSource`). */
  readonly cspSource: string;
  readonly scriptUri: string;
  readonly styleUri: string;
}

/** Attribute values here are our own constants or URIs, escaped anyway so a quote can never end one. */
function attr(value: string): string {
  return value.replace(/&/g, '&amp;').replace(/"/g, '&quot;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}

export function panelHtml(input: PanelHtmlInput): string {
  const nonce = attr(input.nonce);
  const csp = [
    "default-src 'none'",
    `script-src 'nonce-${nonce}'`,
    `style-src ${input.cspSource}`,
    `img-src ${input.cspSource} data:`,
    `font-src ${input.cspSource}`,
    // Not covered by default-src: without these a <base> or <form> could point the page elsewhere.
    "base-uri 'none'",
    "form-action 'none'",
  ].join('; ');
  const cards = CHARTS.map(
    (c) => `
      <section class="card" id="card-${c.id}" data-chart="${c.id}">
        <header class="card-head">
          <button class="card-title" type="button" data-action="select" data-chart="${c.id}" title="${attr(c.shows)}">${attr(c.title)}</button>
          <span class="card-tools">${c.id === 'step' ? '\n            <button type="button" id="step-zoom" data-action="zoom" data-chart="step" aria-pressed="false" title="Zoom to the settling band">Band</button>' : ''}${c.id === 'sweep-margins' ? '\n            <select id="sweep-select" class="hidden" aria-label="Which sweep the sweep charts show"></select>' : ''}
            <button type="button" data-action="png" data-chart="${c.id}" title="Save this chart as PNG">PNG</button>
            <button type="button" data-action="csv" data-chart="${c.id}" title="Save this chart's data as CSV">CSV</button>
          </span>
        </header>
        <div class="canvas-box"><canvas id="chart-${c.id}" role="img" aria-label="${attr(c.title)}"></canvas></div>
        <p class="card-note" id="note-${c.id}"></p>
      </section>`,
  ).join('');
  return `<!DOCTYPE html>
<html lang="en">
<head>
  <meta charset="UTF-8">
  <meta http-equiv="Content-Security-Policy" content="${attr(csp)}">
  <meta name="viewport" content="width=device-width, initial-scale=1.0">
  <link rel="stylesheet" href="${attr(input.styleUri)}">
  <title>Ampnote pole split</title>
</head>
<body>
  <main id="app" class="empty">
    <header class="top">
      <div class="title-row">
        <h1 id="design-name">No design</h1>
        <span id="design-uri" class="muted"></span>
      </div>
      <dl id="summary" class="summary"></dl>
    </header>
    <section class="controls" id="controls" aria-label="Compensation">
      <label class="slider target-box hidden" id="target-box">
        <span class="slider-label">Sweep</span>
        <select id="cc-target" aria-label="Compensation element the sliders vary"></select>
      </label>
      <label class="slider" id="cc-box">
        <span class="slider-label">C<sub>c</sub></span>
        <input id="cc-slider" type="range" min="0" max="1000" step="1" value="500" aria-label="Compensation capacitor (log scale)">
        <output id="cc-value" for="cc-slider"></output>
        <span id="cc-what" class="muted slider-what"></span>
      </label>
      <label class="slider" id="rz-box">
        <span class="slider-label">R<sub>z</sub></span>
        <input id="rz-slider" type="range" min="0" max="1000" step="1" value="0" aria-label="Nulling resistor (log scale, leftmost is none)">
        <output id="rz-value" for="rz-slider"></output>
      </label>
      <span class="buttons">
        <button id="apply" type="button" title="Write these values into the file (undoable)">Apply to file</button>
        <button id="reset" type="button" class="secondary" title="Back to the values as written">Reset</button>
      </span>
      <span id="slider-status" class="muted" aria-live="polite"></span>
    </section>
    <section class="free hidden" id="free" aria-label="Free parameters">
      <div class="free-sliders" id="free-sliders"></div>
      <div class="free-results">
        <p class="free-objective"><span class="muted">Objective</span> <span id="free-objective"></span></p>
        <ul class="free-reqs" id="free-reqs" aria-label="Requirements at these values, worst corner"></ul>
      </div>
      <div class="free-actions">
        <span class="buttons">
          <button id="free-solve" type="button" title="Find the values that meet every requirement in every corner at the least objective">Solve</button>
          <button id="free-apply" type="button" title="Write the free parameters' values into the file (one undoable edit)">Apply to file</button>
          <button id="free-reset" type="button" class="secondary" title="Back to the values as written">Reset</button>
        </span>
        <span id="free-status" class="muted" aria-live="polite"></span>
      </div>
    </section>
    <ul id="problems" class="problems"></ul>
    <p id="empty-note" class="empty-note">Open an .ampnote file and place the cursor in a design.</p>
    <div class="grid" id="grid">${cards}
    </div>
    <footer class="caution" id="caution">${attr(CAUTION)}</footer>
  </main>
  <script nonce="${nonce}" src="${attr(input.scriptUri)}"></script>
</body>
</html>
`;
}

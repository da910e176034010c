// The panel's script inside the webview: renders PanelData sent by the extension host, runs the Cc/Rz
// sliders (or, for a design with free parameters, one slider per free parameter with the requirements at
// those values, the objective, Solve and Apply), exports, keeps its state across hide/show, and follows the theme. Every string the user wrote
// (design names, messages quoting the file) is inserted with textContent.
import type { CompensationTarget, FreePanel, PanelData } from '../../../shared/src/protocol/panelData';
import type { HostToWebview, PanelState, WebviewToHost } from '../../../shared/src/protocol/webviewMessages';
import { formatDb, formatDeg, formatHz, formatSi } from '../../../shared/src/format/si';
import { formatGainMargin } from '../../../shared/src/format/quantities';
import { NOT_COMPUTED } from '../../../shared/src/format/special';
import { CHART_IDS, isChartId, type ChartId } from '../../../shared/src/charts/descriptors';
import { drawCharts, type ChartSet } from '../../../shared/src/charts/draw';
import { chartAbsent, hasChartData, selectedSweep } from '../../../shared/src/charts/presence';
import { sweptText } from '../../../shared/src/charts/sweepCharts';
import { chartCsv } from '../../../shared/src/charts/csv';
import { readThemeColors } from './theme';
import { freePositionToValue, freeValueToPosition, positionToValue, valueToPosition } from './sliderScale';

interface VsCodeApi {
  postMessage(message: WebviewToHost): void;
  getState(): PanelState | undefined;
  setState(state: PanelState): void;
}
declare function acquireVsCodeApi(): VsCodeApi;

declare global {
  interface Window {
    /** The live Chart objects, for tests and for debugging in the webview's developer tools. */
    __ampnoteCharts?: Partial<ChartSet>;
    __ampnoteData?: PanelData | null;
  }
}

const vscode = acquireVsCodeApi();
const $ = <T extends HTMLElement>(id: string) => document.getElementById(id) as T;

const ui = {
  app: $('app'),
  name: $('design-name'),
  uri: $('design-uri'),
  summary: $('summary'),
  problems: $('problems'),
  emptyNote: $('empty-note'),
  grid: $('grid'),
  caution: $('caution'),
  controls: $('controls'),
  ccSlider: $<HTMLInputElement>('cc-slider'),
  ccValue: $<HTMLOutputElement>('cc-value'),
  ccWhat: $('cc-what'),
  targetBox: $('target-box'),
  target: $<HTMLSelectElement>('cc-target'),
  rzSlider: $<HTMLInputElement>('rz-slider'),
  rzValue: $<HTMLOutputElement>('rz-value'),
  rzBox: $('rz-box'),
  apply: $<HTMLButtonElement>('apply'),
  reset: $<HTMLButtonElement>('reset'),
  status: $('slider-status'),
  free: $('free'),
  freeSliders: $('free-sliders'),
  freeObjective: $('free-objective'),
  freeReqs: $('free-reqs'),
  freeSolve: $<HTMLButtonElement>('free-solve'),
  freeApply: $<HTMLButtonElement>('free-apply'),
  freeReset: $<HTMLButtonElement>('free-reset'),
  freeStatus: $('free-status'),
  sweepSelect: $<HTMLSelectElement>('sweep-select'),
};

let state: PanelState = vscode.getState() ?? { selected: 'locus' };
let data: PanelData | null = null;
let charts: Partial<ChartSet> = {};
let designKey = '';
/** A slider message waiting to be sent while the previous request is still answering. */
let pending: WebviewToHost | undefined;
/** The free sliders' layout (names and bounds), so that rows are rebuilt only when it changes. */
let freeLayout = '';
let inFlight = false;
/** A slider thumb is held by the pointer. */
let dragging = false;

function saveState(next: Partial<PanelState>): void {
  state = { ...state, ...next };
  vscode.setState(state);
}

function post(message: WebviewToHost): void {
  vscode.postMessage(message);
}

// ---- rendering ---------------------------------------------------------------------------------------

/** A usable number: the data crossed JSON, where NaN and ±Infinity arrive as null. */
const isNum = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);

function setText(el: HTMLElement, text: string): void {
  el.textContent = text;
}

/** The last path segment of a URI, decoded when it is well-formed. */
function fileName(uri: string): string {
  const last = uri.replace(/[?#].*$/, '').replace(/^.*\//, '');
  try {
    return decodeURIComponent(last);
  } catch {
    return last;
  }
}

function renderSummary(d: PanelData): void {
  ui.summary.replaceChildren();
  const items: [string, string][] = [
    ['closed loop', d.summary.closedLoop],
    ['UGF', isNum(d.summary.ugfHz) ? formatHz(d.summary.ugfHz) : '—'],
    ['phase margin', isNum(d.summary.phaseMarginDeg) ? formatDeg(d.summary.phaseMarginDeg) : '—'],
    // Absent from an analyzed loop: the phase never reaches −180°, an unbounded margin. A null is a
    // non-finite number that crossed JSON, which can no longer be read.
    [
      'gain margin',
      d.problems.length > 0 || d.summary.gainMarginDb === null
        ? NOT_COMPUTED
        : formatGainMargin(d.summary.gainMarginDb),
    ],
    ['DC gain', Number.isFinite(d.summary.dcGainDb) ? formatDb(d.summary.dcGainDb) : '—'],
    ['slew', isNum(d.summary.slewVperUs) ? `${d.summary.slewVperUs.toPrecision(3)} V/µs` : '—'],
  ];
  for (const [k, v] of items) {
    const box = document.createElement('div');
    const dt = document.createElement('dt');
    const dd = document.createElement('dd');
    dt.textContent = k;
    dd.textContent = v;
    box.append(dt, dd);
    ui.summary.appendChild(box);
  }
}

function renderProblems(d: PanelData): void {
  ui.problems.replaceChildren();
  for (const p of d.problems) {
    const li = document.createElement('li');
    li.textContent = p;
    ui.problems.appendChild(li);
  }
}

function renderNotes(d: PanelData): void {
  if (d.problems.length > 0) {
    for (const id of CHART_IDS)
      setText($(`note-${id}`), 'Not drawn: the design could not be analyzed (see above).');
    return;
  }
  const notes: Record<ChartId, string> = {
    locus: d.compensation
      ? `Cc from 0 (left edge) to ${formatSi(d.locus.poles[0]?.cc.at(-1) ?? 0, 'F')}; × marks the poles at the Cc shown, ○ the zeros. Hover a pole for its node participation.`
      : 'This design has no compensation capacitor to sweep.',
    bode: isNum(d.bode.ugfHz)
      ? `Unity crossing at ${formatHz(d.bode.ugfHz)}${d.bode.crossings.length > 1 ? ` (the last of ${d.bode.crossings.length} crossings)` : ''}.`
      : 'The loop gain never reaches unity.',
    step:
      d.step.t.length === 0
        ? 'No step response for this design.'
        : d.step.stable === false
          ? 'The closed loop is unstable (a closed-loop pole in the right half-plane): the step grows without bound.'
          : typeof d.step.settlingTime === 'number'
            ? `Settles into ±${(100 * d.step.tolerance).toPrecision(2)} % in ${formatSi(d.step.settlingTime, 's')}; overshoot ${isNum(d.step.overshootPct) ? d.step.overshootPct.toFixed(1) : '—'} %.`
            : `Does not settle into ±${(100 * d.step.tolerance).toPrecision(2)} % within the time shown.`,
    splane:
      'Axes are symmetric-logarithmic: sign(v)·log10(1 + |v|/v0), with v0 a decade below the smallest root.',
    'sweep-margins': sweepNote(d),
    zout: d.closedCircuit
      ? `The closed circuit's output impedance, ${formatSi(d.closedCircuit.zoutOhm[0] ?? NaN, 'ohm')} at ${formatHz(d.closedCircuit.hz[0] ?? NaN)}.`
      : '',
    'load-step': d.closedCircuit?.loadStep
      ? `Settles to ${formatSi(d.closedCircuit.loadStep.final, 'V/A')} per ampere drawn (−Zout at DC).`
      : '',
    'supply-rejection': d.closedCircuit?.supplies.length
      ? d.closedCircuit.supplies
          .map(
            (s) =>
              `${s.node}: ${(s.rejectionDb[0] ?? NaN).toFixed(1)} dB at ${formatHz(d.closedCircuit!.hz[0] ?? NaN)}`,
          )
          .join('; ')
      : '',
    'sweep-locus': selectedSweep(d, sweepIndex(d))
      ? `Nominal corner, the design as written. ○ where ${selectedSweep(d, sweepIndex(d))!.param} starts, × where it ends; hover a point for its value.`
      : '',
  };
  const ls = d.step.largeSignal;
  // The large-signal step beside the small-signal one: its settling and how long it slews (shaded).
  if (ls) {
    const slewing = ls.slewing.reduce((sum, r) => sum + (r.end - r.start), 0);
    notes.step += ` Large-signal ${formatSi(ls.amplitude, 'V')} step: ${
      ls.settlingTime !== undefined
        ? `settles in ${formatSi(ls.settlingTime, 's')}`
        : 'does not settle within the time shown'
    }, slewing ${formatSi(slewing, 's')}${ls.limitingStage ? ` (stage ${ls.limitingStage})` : ''}.`;
  }
  for (const id of CHART_IDS) setText($(`note-${id}`), notes[id]);
}

/** The sweep the sweep charts show: the one chosen, when the design still has it. */
function sweepIndex(d: PanelData): number {
  const n = d.sweeps?.length ?? 0;
  return state.sweep !== undefined && state.sweep < n ? state.sweep : 0;
}

function sweepNote(d: PanelData): string {
  const sw = selectedSweep(d, sweepIndex(d));
  if (!sw) return '';
  const worst = sw.worstPhaseMargin;
  const lowest = worst
    ? `Lowest phase margin ${formatDeg(worst.value)} at ${sw.param} = ${sweptText(sw, worst.at)}${sw.corners.length > 1 ? ` (${worst.corner})` : ''}. `
    : 'No unity crossing anywhere in the range. ';
  const fails = sw.failing.length
    ? `Shaded: ${[...new Set(sw.failing.map((f) => f.label))].join(', ')} fails there.`
    : 'Every requirement holds over the whole range.';
  return `${lowest}${fails} The design as written, not the sliders.`;
}

/** The sweep selector, shown when the design has more than one sweep; names come from the file (text). */
function renderSweepSelect(d: PanelData): void {
  const sweeps = d.sweeps ?? [];
  ui.sweepSelect.classList.toggle('hidden', sweeps.length < 2);
  if (sweeps.length < 2) return;
  ui.sweepSelect.replaceChildren(
    ...sweeps.map((sw, i) => {
      const o = document.createElement('option');
      o.value = String(i);
      o.textContent = `${sw.param}: ${sweptText(sw, sw.values[0]!)} to ${sweptText(sw, sw.values.at(-1)!)}`;
      return o;
    }),
  );
  ui.sweepSelect.value = String(sweepIndex(d));
}

const targetValue = (t: CompensationTarget) => `${t.kind}:${t.index}`;

/** The selector lists every element when there is a choice; with one element its name stands beside Cc. */
function renderTarget(d: PanelData): void {
  const choices = d.compensationChoices ?? [];
  const several = choices.length > 1 && !!d.compensation;
  ui.targetBox.classList.toggle('hidden', !several);
  ui.ccWhat.classList.toggle('hidden', several);
  if (!several) return;
  const options = choices.map((c) => {
    const o = document.createElement('option');
    o.value = targetValue(c);
    o.textContent = c.label;
    return o;
  });
  ui.target.replaceChildren(...options);
  ui.target.value = targetValue(d.compensation!);
}

function renderSliders(d: PanelData): void {
  const s = d.sliders;
  ui.controls.classList.toggle('hidden', !s || !d.compensation);
  if (!s || !d.compensation) return;
  setText(ui.ccWhat, d.compensation.label ?? '');
  renderTarget(d);
  ui.rzBox.classList.toggle('hidden', d.compensation.kind !== 'miller');
  // While a thumb is held (or a newer value waits to be sent) the answer is for an older position: moving
  // the thumb back to it would make it jump under the pointer.
  if (!dragging && !pending) {
    const cc = d.cc ?? d.compensation.ccWritten;
    ui.ccSlider.value = String(valueToPosition(cc, s.cc, false));
    setText(ui.ccValue, formatSi(cc, 'F'));
    const rz = d.rz ?? d.compensation.rzWritten ?? 0;
    ui.rzSlider.value = String(valueToPosition(rz, s.rz, true));
    setText(ui.rzValue, rz > 0 ? formatSi(rz, 'ohm') : 'none');
  }
  const changed = state.cc !== undefined || state.rz !== undefined;
  ui.apply.disabled = !changed;
  ui.reset.disabled = !changed;
}

/** The status line in view: the free parameters' when the design has them, else the Cc/Rz sliders'. */
const statusLine = () => (data?.free ? ui.freeStatus : ui.status);

function setStatus(text: string, error = false): void {
  for (const el of [ui.status, ui.freeStatus]) {
    setText(el, el === statusLine() ? text : '');
    el.classList.toggle('error', error && el === statusLine());
  }
}

const freeInputs = () => [...ui.freeSliders.querySelectorAll<HTMLInputElement>('input[type="range"]')];

/** One row per free parameter; names come from the file, so they are inserted as text. */
function buildFreeSliders(free: FreePanel): void {
  const rows = free.sliders.map((s, i) => {
    const row = document.createElement('label');
    row.className = 'free-slider';
    const name = document.createElement('span');
    name.className = 'slider-label';
    name.textContent = s.name;
    const input = document.createElement('input');
    input.type = 'range';
    input.min = '0';
    input.max = '1000';
    input.step = '1';
    input.dataset.index = String(i);
    input.setAttribute('aria-label', `${s.name} (${s.log ? 'log' : 'linear'} scale)`);
    const output = document.createElement('output');
    const bounds = document.createElement('span');
    bounds.className = 'muted slider-what';
    bounds.textContent = `${formatSi(s.low, s.unit)} .. ${formatSi(s.high, s.unit)}${s.log ? '' : ' (linear)'}`;
    row.append(name, input, output, bounds);
    input.addEventListener('input', onFreeInput);
    input.addEventListener('pointerdown', () => (dragging = true));
    for (const end of ['pointerup', 'pointercancel', 'lostpointercapture'] as const)
      input.addEventListener(end, () => (dragging = false));
    return row;
  });
  ui.freeSliders.replaceChildren(...rows);
}

function renderFree(d: PanelData): void {
  const free = d.free;
  ui.free.classList.toggle('hidden', !free);
  if (!free) {
    freeLayout = '';
    return;
  }
  ui.controls.classList.add('hidden');
  const layoutKey = JSON.stringify(free.sliders.map((s) => [s.name, s.low, s.high, s.log, s.unit]));
  if (layoutKey !== freeLayout) {
    freeLayout = layoutKey;
    buildFreeSliders(free);
  }
  if (!dragging && !pending) {
    const inputs = freeInputs();
    free.sliders.forEach((s, i) => {
      const input = inputs[i]!;
      input.value = String(freeValueToPosition(s.value, s));
      setText(input.nextElementSibling as HTMLElement, formatSi(s.value, s.unit));
    });
    const moved = free.sliders.some((s) => s.value !== s.written);
    const values = Object.fromEntries(free.sliders.map((s) => [s.name, s.value]));
    if (moved || state.free !== undefined) saveState({ free: moved ? values : undefined });
  }
  const o = free.objective;
  // A written expression has no unit of its own here: its number is shown plain, as the solve shows it.
  const objective = !isNum(o.value) ? '—' : o.unit ? formatSi(o.value, o.unit) : `${+o.value.toPrecision(4)}`;
  setText(ui.freeObjective, `${o.expression}: ${objective}`);
  ui.freeReqs.replaceChildren(
    ...free.requirements.map((r) => {
      const li = document.createElement('li');
      li.classList.toggle('fail', !r.met);
      const verdict = document.createElement('span');
      verdict.className = 'verdict';
      verdict.textContent = r.met ? 'pass' : 'FAIL';
      const where = r.worst.corner === 'nominal' ? 'nominal' : `corner ${r.worst.corner}`;
      li.append(verdict, `${r.label} ${r.required}: worst ${r.worst.text} (${where})`);
      return li;
    }),
  );
  ui.freeSolve.disabled = false;
  ui.freeApply.disabled = free.edits.length === 0 || free.refused !== undefined;
  ui.freeReset.disabled = free.edits.length === 0 && state.free === undefined;
}

/** The free sliders' values as positioned now, by parameter name. */
function freeValues(): Record<string, number> {
  const free = data?.free;
  if (!free) return {};
  const inputs = freeInputs();
  return Object.fromEntries(
    free.sliders.map((s, i) => [s.name, freePositionToValue(Number(inputs[i]!.value), s)]),
  );
}

function onFreeInput(ev: Event): void {
  const free = data?.free;
  if (!free) return;
  const input = ev.target as HTMLInputElement;
  const slider = free.sliders[Number(input.dataset.index)];
  if (!slider) return;
  setText(
    input.nextElementSibling as HTMLElement,
    formatSi(freePositionToValue(Number(input.value), slider), slider.unit),
  );
  const values = freeValues();
  saveState({ free: values });
  ui.freeApply.disabled = false;
  ui.freeReset.disabled = false;
  sendLive({ type: 'free', values });
}

/** Charts with nothing to draw show only their note (no empty axes), and offer nothing to export. */
function markEmpty(d: PanelData): void {
  for (const id of CHART_IDS) {
    const card = $(`card-${id}`);
    const has = hasChartData(id, d);
    card.classList.toggle('nodata', !has);
    card.classList.toggle('absent', chartAbsent(id, d));
    for (const b of card.querySelectorAll<HTMLButtonElement>('.card-tools button')) b.disabled = !has;
  }
}

function layout(): void {
  for (const id of CHART_IDS) $(`card-${id}`).classList.toggle('selected', id === state.selected);
}

function render(d: PanelData | null): void {
  data = d;
  window.__ampnoteData = d;
  ui.app.classList.toggle('empty', d === null);
  if (d === null) {
    setText(ui.name, 'No design');
    setText(ui.uri, '');
    ui.summary.replaceChildren();
    ui.problems.replaceChildren();
    return;
  }
  const key = `${d.uri}#${d.design}`;
  if (designKey === '') designKey = key;
  if (designKey !== '' && key !== designKey) {
    designKey = key;
    if (state.cc !== undefined || state.rz !== undefined || state.free !== undefined)
      saveState({ cc: undefined, rz: undefined, free: undefined });
  }
  if (state.uri !== d.uri || state.design !== d.design) saveState({ uri: d.uri, design: d.design });
  const shown = d.compensation ? { kind: d.compensation.kind, index: d.compensation.index } : undefined;
  // Another element of the same design (picked by the cursor): slider values were for the previous one.
  if (
    state.compensation &&
    shown &&
    (state.compensation.kind !== shown.kind || state.compensation.index !== shown.index) &&
    (state.cc !== undefined || state.rz !== undefined)
  )
    saveState({ cc: undefined, rz: undefined });
  if (state.compensation?.kind !== shown?.kind || state.compensation?.index !== shown?.index)
    saveState({ compensation: shown });
  setText(ui.name, d.design);
  setText(ui.uri, fileName(d.uri));
  setText(ui.caution, d.caution);
  renderSummary(d);
  renderProblems(d);
  renderNotes(d);
  renderSliders(d);
  renderFree(d);
  renderSweepSelect(d);
  markEmpty(d);
  layout();
  redraw();
}

/** Draws the current data with the theme's colours as they are now (also after a theme change). */
function redraw(): void {
  if (!data) return;
  $('step-zoom').setAttribute('aria-pressed', String(state.stepBandZoom === true));
  charts = drawCharts(ui.grid, data, {
    colors: readThemeColors(document.body),
    previous: charts,
    stepBandZoom: state.stepBandZoom === true,
    sweep: sweepIndex(data),
  });
  window.__ampnoteCharts = charts;
}

// ---- sliders ------------------------------------------------------------------------------------------

function sliderValues(): { cc?: number; rz?: number } {
  const s = data?.sliders;
  if (!s) return {};
  return {
    cc: positionToValue(Number(ui.ccSlider.value), s.cc, false),
    rz:
      data?.compensation?.kind === 'miller'
        ? positionToValue(Number(ui.rzSlider.value), s.rz, true)
        : undefined,
  };
}

/** Sends a slider's message, or keeps it (the latest only) until the answer to the previous one is in. */
function sendLive(message: WebviewToHost): void {
  if (inFlight) {
    pending = message;
    return;
  }
  inFlight = true;
  setStatus('computing…');
  post(message);
}

function sendSlider(values: { cc?: number; rz?: number }): void {
  sendLive({ type: 'slider', ...values });
}

function onSliderInput(): void {
  const v = sliderValues();
  if (v.cc !== undefined) setText(ui.ccValue, formatSi(v.cc, 'F'));
  if (v.rz !== undefined) setText(ui.rzValue, v.rz > 0 ? formatSi(v.rz, 'ohm') : 'none');
  saveState({ cc: v.cc, rz: v.rz });
  ui.apply.disabled = false;
  ui.reset.disabled = false;
  sendSlider(v);
}

ui.ccSlider.addEventListener('input', onSliderInput);
ui.rzSlider.addEventListener('input', onSliderInput);
for (const slider of [ui.ccSlider, ui.rzSlider]) {
  slider.addEventListener('pointerdown', () => (dragging = true));
  for (const end of ['pointerup', 'pointercancel', 'lostpointercapture'] as const) {
    slider.addEventListener(end, () => (dragging = false));
  }
}
ui.apply.addEventListener('click', () => {
  const v = sliderValues();
  post({
    type: 'apply',
    cc: state.cc !== undefined ? v.cc : undefined,
    rz: state.rz !== undefined ? v.rz : undefined,
  });
  // The file now holds these values; the next data from the host shows them as written.
  saveState({ cc: undefined, rz: undefined });
  ui.apply.disabled = true;
  ui.reset.disabled = true;
});
ui.target.addEventListener('change', () => {
  const [kind, index] = ui.target.value.split(':');
  if ((kind !== 'miller' && kind !== 'buffered') || !Number.isInteger(Number(index))) return;
  const target: CompensationTarget = { kind, index: Number(index) };
  // Slider values belong to the element they moved: the new one starts from its written values.
  saveState({ compensation: target, cc: undefined, rz: undefined });
  pending = undefined;
  inFlight = true;
  setText(ui.status, 'computing…');
  post({ type: 'compensation', target });
});
ui.sweepSelect.addEventListener('change', () => {
  const i = Number(ui.sweepSelect.value);
  if (!Number.isInteger(i) || i < 0) return;
  saveState({ sweep: i });
  if (data) renderNotes(data);
  redraw();
});
ui.reset.addEventListener('click', () => {
  saveState({ cc: undefined, rz: undefined });
  sendSlider({});
});
ui.freeSolve.addEventListener('click', () => {
  // The host answers with the solved values as new data, then the solve's summary as the status.
  pending = undefined;
  inFlight = true;
  ui.freeSolve.disabled = true;
  setStatus('solving…');
  post({ type: 'solve' });
});
ui.freeApply.addEventListener('click', () => {
  post({ type: 'applyFree', values: freeValues() });
  ui.freeApply.disabled = true;
});
ui.freeReset.addEventListener('click', () => {
  saveState({ free: undefined });
  sendLive({ type: 'free', values: {} });
});

// ---- chart tools (event delegation: no inline handlers) ---------------------------------------------------

ui.grid.addEventListener('click', (ev) => {
  const button = (ev.target as HTMLElement).closest<HTMLButtonElement>('button[data-action]');
  const chart = button?.dataset.chart;
  if (!button || !isChartId(chart)) return;
  switch (button.dataset.action) {
    case 'select':
      saveState({ selected: chart });
      layout();
      // The canvases changed size with the layout; chart.js follows on its own resize observer.
      break;
    case 'zoom':
      saveState({ stepBandZoom: !state.stepBandZoom });
      redraw();
      break;
    case 'png': {
      const c = charts[chart];
      if (c) post({ type: 'exportPng', chart, dataUrl: c.toBase64Image('image/png', 1) });
      break;
    }
    case 'csv':
      if (data) post({ type: 'exportCsv', chart, csv: chartCsv(chart, data, sweepIndex(data)) });
      break;
  }
});

// ---- messages from the host -----------------------------------------------------------------------------

window.addEventListener('message', (event: MessageEvent<HostToWebview>) => {
  const msg = event.data;
  if (!msg || typeof msg !== 'object') return;
  switch (msg.type) {
    case 'data': {
      inFlight = false;
      render(msg.data);
      setStatus(msg.data?.free?.refused ?? '', msg.data?.free?.refused !== undefined);
      if (pending) {
        const next = pending;
        pending = undefined;
        sendLive(next);
      }
      break;
    }
    case 'theme':
      redraw();
      break;
    case 'restore':
      saveState(msg.state);
      layout();
      redraw();
      break;
    case 'status':
      if (msg.error) {
        inFlight = false;
        ui.freeSolve.disabled = false;
      }
      setStatus(msg.text, msg.error === true);
      break;
  }
});

// The host sets the theme as classes on <body>; redraw when they change (the CSS variables change with them).
new MutationObserver(() => redraw()).observe(document.body, {
  attributes: true,
  attributeFilter: ['class'],
});

layout();
post({ type: 'ready' });
if (state.compensation) post({ type: 'compensation', target: state.compensation });
if (state.cc !== undefined || state.rz !== undefined) post({ type: 'slider', cc: state.cc, rz: state.rz });
if (state.free !== undefined) post({ type: 'free', values: state.free });

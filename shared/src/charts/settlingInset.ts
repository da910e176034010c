// The step chart's settling marks, drawn on the canvas: a tag on the settling instant, a dot where the
// response enters its band for the last time, and an inset that magnifies the tail around the final value.
// At a tight band (0.1 % of a unit step is under a pixel at the full view) the band cannot be seen on the
// main axes; the inset shows it at a scale where it can, without changing the main chart's axes.
import type { Chart, Plugin } from 'chart.js';

export interface SettlingMarks {
  /** Off when there is nothing to settle to (an unstable loop, no response). */
  readonly show: boolean;
  /** Off when the chart is zoomed to its band already: the main axes show it then. */
  readonly inset: boolean;
  readonly final: number;
  /** Half-width of the band (same unit as the output). */
  readonly band: number;
  readonly settlingTime?: number;
  /** e.g. `±0.10 %`. */
  readonly bandText: string;
  /** e.g. `252 ns`. */
  readonly timeText?: string;
  readonly colors: {
    readonly curve: string;
    readonly band: string;
    readonly bandFill: string;
    readonly marker: string;
    readonly text: string;
    readonly muted: string;
    readonly grid: string;
    readonly background: string;
    readonly fontFamily: string;
    readonly fontSize: number;
  };
}

/** The inset's half-height, in band widths either side of the final value. */
export const INSET_BANDS = 4;
/** Smallest plot area (px) in which the inset fits without hiding the rise of the response. */
const MIN_AREA = { width: 240, height: 110 };

/** What the inset shows, kept on the chart for tests and debugging. */
export interface InsetGeometry {
  readonly box: { x: number; y: number; width: number; height: number };
  readonly title: string;
  readonly tMin: number;
  readonly tMax: number;
  readonly yMin: number;
  readonly yMax: number;
}

type StepChart = Chart<'scatter', { x: number; y: number }[]> & {
  $settlingInset?: InsetGeometry;
  $settlingTag?: { x: number; y: number; text: string };
};

function stepPoints(chart: StepChart): { x: number; y: number }[] {
  const ds = chart.data.datasets.find((d) => (d as { role?: string }).role === 'step');
  return (ds?.data ?? []).filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y));
}

/** The response at time t, linear between samples. */
function valueAt(points: readonly { x: number; y: number }[], t: number): number | undefined {
  const i = points.findIndex((p) => p.x >= t);
  if (i < 0) return undefined;
  if (i === 0) return points[0]!.y;
  const a = points[i - 1]!;
  const b = points[i]!;
  return b.x === a.x ? b.y : a.y + ((t - a.x) / (b.x - a.x)) * (b.y - a.y);
}

function roundedRect(ctx: CanvasRenderingContext2D, x: number, y: number, w: number, h: number, r: number) {
  ctx.beginPath();
  ctx.moveTo(x + r, y);
  ctx.arcTo(x + w, y, x + w, y + h, r);
  ctx.arcTo(x + w, y + h, x, y + h, r);
  ctx.arcTo(x, y + h, x, y, r);
  ctx.arcTo(x, y, x + w, y, r);
  ctx.closePath();
}

function drawTag(chart: StepChart, m: SettlingMarks, points: readonly { x: number; y: number }[]) {
  if (m.settlingTime === undefined || !m.timeText) return;
  const { ctx, chartArea: area } = chart;
  const xScale = chart.scales['x']!;
  const yScale = chart.scales['y']!;
  const x = xScale.getPixelForValue(m.settlingTime);
  if (!(x >= area.left && x <= area.right)) return;
  const c = m.colors;
  ctx.save();
  // Where the response enters the band for good.
  const yv = valueAt(points, m.settlingTime);
  if (yv !== undefined) {
    const y = yScale.getPixelForValue(yv);
    if (y >= area.top && y <= area.bottom) {
      ctx.beginPath();
      ctx.arc(x, y, 3.5, 0, 2 * Math.PI);
      ctx.fillStyle = c.background;
      ctx.fill();
      ctx.lineWidth = 2;
      ctx.strokeStyle = c.band;
      ctx.stroke();
    }
  }
  // The tag at the top of the marker line, kept inside the plot area.
  const text = `settled ${m.timeText}`;
  ctx.font = `${c.fontSize - 1}px ${c.fontFamily}`;
  const w = ctx.measureText(text).width + 10;
  const h = c.fontSize + 6;
  const left = Math.min(Math.max(x - w / 2, area.left + 2), area.right - w - 2);
  // On the marker line just outside the band: at the full view on the side a settled response leaves
  // empty (away from the start); zoomed to the band, above it, where the rising response has not been.
  const finalPx = yScale.getPixelForValue(m.final);
  const edges = [m.final - m.band, m.final + m.band].map((v) => yScale.getPixelForValue(v));
  const below = m.inset ? finalPx - area.top < area.bottom - finalPx : m.final < 0;
  const top = Math.min(
    Math.max(below ? Math.max(...edges) + 8 : Math.min(...edges) - h - 8, area.top + 2),
    area.bottom - h - 2,
  );
  roundedRect(ctx, left, top, w, h, 3);
  ctx.fillStyle = c.background;
  ctx.fill();
  ctx.lineWidth = 1;
  ctx.strokeStyle = c.marker;
  ctx.stroke();
  ctx.fillStyle = c.text;
  ctx.textBaseline = 'middle';
  ctx.textAlign = 'left';
  ctx.fillText(text, left + 5, top + h / 2 + 0.5);
  ctx.restore();
  chart.$settlingTag = { x, y: top, text };
}

function drawInset(chart: StepChart, m: SettlingMarks, points: readonly { x: number; y: number }[]) {
  const { ctx, chartArea: area } = chart;
  delete chart.$settlingInset;
  if (area.width < MIN_AREA.width || area.height < MIN_AREA.height || points.length < 2) return;
  const c = m.colors;
  const yScale = chart.scales['y']!;
  const t0 = points[0]!.x;
  const t1 = points[points.length - 1]!.x;
  const ts = m.settlingTime;
  // From a while before the settling instant (or the second half of the record) to the end.
  const tMin = ts !== undefined ? Math.max(t0, ts - 0.6 * (t1 - ts)) : t0 + 0.5 * (t1 - t0);
  const tMax = t1;
  if (!(tMax > tMin)) return;
  const yMin = m.final - INSET_BANDS * m.band;
  const yMax = m.final + INSET_BANDS * m.band;

  // Opposite the final value, where a settled response leaves the plot empty.
  const finalPx = yScale.getPixelForValue(m.final);
  const nearTop = finalPx - area.top < area.bottom - finalPx;
  const width = Math.round(Math.min(area.width * 0.46, 300));
  const height = Math.round(Math.min(area.height * 0.5, 150));
  const box = {
    x: area.right - width - 8,
    y: nearTop ? area.bottom - height - 8 : area.top + 8,
    width,
    height,
  };
  const pad = { left: 6, right: 6, top: c.fontSize + 8, bottom: 6 };
  const plot = {
    x: box.x + pad.left,
    y: box.y + pad.top,
    w: box.width - pad.left - pad.right,
    h: box.height - pad.top - pad.bottom,
  };
  const px = (t: number) => plot.x + ((t - tMin) / (tMax - tMin)) * plot.w;
  const py = (v: number) => plot.y + ((yMax - v) / (yMax - yMin)) * plot.h;

  ctx.save();
  roundedRect(ctx, box.x, box.y, box.width, box.height, 4);
  ctx.fillStyle = c.background;
  ctx.fill();
  ctx.lineWidth = 1;
  ctx.strokeStyle = c.grid;
  ctx.stroke();

  ctx.font = `${c.fontSize - 1}px ${c.fontFamily}`;
  ctx.textBaseline = 'middle';
  ctx.fillStyle = c.muted;
  ctx.textAlign = 'left';
  // The longest title that fits a narrow card.
  const titles = [`band ${m.bandText}, magnified`, `band ${m.bandText}`, m.bandText];
  const title = titles.find((t) => ctx.measureText(t).width <= box.width - 14) ?? m.bandText;
  ctx.fillText(title, box.x + 7, box.y + pad.top / 2 + 1);

  ctx.save();
  ctx.beginPath();
  ctx.rect(plot.x, plot.y, plot.w, plot.h);
  ctx.clip();
  // The band, its edges and the final value.
  ctx.fillStyle = c.bandFill;
  ctx.fillRect(plot.x, py(m.final + m.band), plot.w, py(m.final - m.band) - py(m.final + m.band));
  ctx.strokeStyle = c.band;
  ctx.setLineDash([4, 3]);
  for (const edge of [m.final - m.band, m.final + m.band]) {
    ctx.beginPath();
    ctx.moveTo(plot.x, py(edge));
    ctx.lineTo(plot.x + plot.w, py(edge));
    ctx.stroke();
  }
  ctx.setLineDash([]);
  if (ts !== undefined && ts >= tMin) {
    ctx.strokeStyle = c.marker;
    ctx.beginPath();
    ctx.moveTo(px(ts), plot.y);
    ctx.lineTo(px(ts), plot.y + plot.h);
    ctx.stroke();
  }
  // The response, clipped to the window: outside the band it leaves by the top or the bottom.
  ctx.strokeStyle = c.curve;
  ctx.lineWidth = 1.75;
  ctx.beginPath();
  let started = false;
  for (let i = 0; i < points.length; i++) {
    const p = points[i]!;
    const next = points[i + 1];
    if (p.x < tMin && !(next && next.x >= tMin)) continue;
    const y = Math.min(Math.max(py(p.y), plot.y - 50), plot.y + plot.h + 50);
    if (!started) ctx.moveTo(px(p.x), y);
    else ctx.lineTo(px(p.x), y);
    started = true;
  }
  ctx.stroke();
  ctx.restore();
  ctx.restore();
  chart.$settlingInset = { box, title, tMin, tMax, yMin, yMax };
}

export const settlingMarksPlugin: Plugin<'scatter'> = {
  id: 'ampnoteSettling',
  afterDatasetsDraw(chart, _args, opts: Partial<SettlingMarks>) {
    const c = chart as unknown as StepChart;
    delete c.$settlingInset;
    delete c.$settlingTag;
    if (!opts.show || !opts.colors || !(Number(opts.band) > 0)) return;
    const m = opts as SettlingMarks;
    const points = stepPoints(c);
    if (m.inset) drawInset(c, m, points);
    drawTag(c, m, points);
  },
};

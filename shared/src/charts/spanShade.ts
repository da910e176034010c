// Shades stretches of a chart's x axis under its lines: where a sweep's requirement fails, where a
// large-signal step slews. Options: `plugins.ampnoteSpans` = { ranges, color }.
import type { Plugin } from 'chart.js';

export interface SpanShade {
  readonly ranges: readonly { readonly from: number; readonly to: number }[];
  readonly color: string;
}

export const spanShadePlugin: Plugin<'scatter'> = {
  id: 'ampnoteSpans',
  beforeDatasetsDraw(chart, _args, opts: Partial<SpanShade>) {
    const x = chart.scales['x'];
    if (!x || !opts.ranges?.length || !opts.color) return;
    const { ctx, chartArea } = chart;
    ctx.save();
    ctx.fillStyle = opts.color;
    for (const r of opts.ranges) {
      const a = x.getPixelForValue(r.from);
      const b = x.getPixelForValue(r.to);
      const left = Math.max(chartArea.left, Math.min(a, b));
      const right = Math.min(chartArea.right, Math.max(a, b));
      if (right < chartArea.left || left > chartArea.right) continue;
      // A single value (from = to) still shows, as a thin band.
      ctx.fillRect(left, chartArea.top, Math.max(2, right - left), chartArea.bottom - chartArea.top);
    }
    ctx.restore();
  },
};

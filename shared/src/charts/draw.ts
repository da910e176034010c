// The charts, drawn with chart.js from PanelData alone into canvases the caller hands over. No editor
// API here: the panel's script imports this module, and the terminal checker's report inlines it as a
// browser script (global `AmpnoteCharts`, see cli/src/chartsScript.ts).
import {
  Chart,
  Filler,
  Legend,
  LinearScale,
  LineElement,
  LogarithmicScale,
  PointElement,
  ScatterController,
  Tooltip,
  type ChartConfiguration,
  type ChartDataset,
  type Plugin,
  type Scale,
  type TooltipItem,
} from 'chart.js';
import type { PanelData, PanelPole } from '../protocol/panelData';
import { CHART_IDS, type ChartId } from './descriptors';
import { formatDeg, formatHz, formatSi } from '../format/si';
import { symlog, symlogInverse, symlogKnee, symlogTicks } from './symlog';
import { withAlpha, type ChartColors } from './colors';
import { settlingMarksPlugin, type SettlingMarks } from './settlingInset';
import { spanShadePlugin } from './spanShade';
import { loadStepConfig, supplyRejectionConfig, zoutConfig } from './circuitCharts';
import { modulusHz } from '../numeric/complex';
import { chartAbsent } from './presence';
import { sweepLocusConfig, sweepMarginsConfig, type ChartKit } from './sweepCharts';

Chart.register(
  ScatterController,
  LineElement,
  PointElement,
  LinearScale,
  LogarithmicScale,
  Tooltip,
  Legend,
  Filler,
);

/** What each dataset shows; tests and CSV export find datasets by role, not by position. */
export type DatasetRole =
  | 'pole-branch'
  | 'zero-branch'
  | 'current-cc'
  | 'current-pole'
  | 'current-zero'
  | 'magnitude'
  | 'phase'
  | 'ugf'
  | 'phase-margin'
  | 'phase-reference'
  | 'crossing'
  | 'step'
  | 'large-signal-step'
  | 'band-low'
  | 'band-high'
  | 'settling'
  | 'pole'
  | 'zero'
  | 'closed-pole'
  | 'sweep-pm'
  | 'sweep-ugf'
  | 'sweep-gm'
  | 'sweep-requirement'
  | 'sweep-worst'
  | 'sweep-pole-track'
  | 'sweep-zero-track'
  | 'sweep-start'
  | 'sweep-end'
  | 'zout'
  | 'load-step'
  | 'supply-rejection';

/** A data point keeps the value it stands for beside its plotted position (which may be transformed). */
export interface PlotPoint {
  x: number;
  y: number;
  /** Swept Cc in farads (locus: the plotted x of Cc = 0 is the axis' left edge). */
  cc?: number;
  re?: number;
  im?: number;
  pole?: PanelPole;
  rhp?: boolean;
  /** A pole of the closed loop (s-plane map). */
  closed?: boolean;
  /** The swept parameter's value at this point (sweep charts). */
  swept?: number;
  /** The corner a sweep line belongs to. */
  corner?: string;
  /** Which root a locus point is, along a sweep. */
  kind?: 'pole' | 'zero';
}

export type RoleDataset = ChartDataset<'scatter', PlotPoint[]> & { role: DatasetRole };

/** The charts drawn, by id; a chart left out for this design (presence.ts) is absent. */
export type ChartSet = Partial<Record<ChartId, Chart<'scatter', PlotPoint[]>>>;

export interface DrawOptions {
  readonly colors: ChartColors;
  /** Existing charts to update in place (keeps hover state and avoids flicker while a slider moves). */
  readonly previous?: Partial<ChartSet>;
  /** Step chart: show only a few band widths around the final value, so a tight band is readable. */
  readonly stepBandZoom?: boolean;
  /** Which of the design's sweeps the sweep charts show (default the first). */
  readonly sweep?: number;
}

/** Paints the theme background under each chart, so an exported PNG reads the same as the panel. */
const backgroundPlugin: Plugin<'scatter'> = {
  id: 'ampnoteBackground',
  beforeDraw(chart, _args, opts: { color?: string }) {
    if (!opts.color) return;
    const { ctx, width, height } = chart;
    ctx.save();
    ctx.fillStyle = opts.color;
    ctx.fillRect(0, 0, width, height);
    ctx.restore();
  },
};

/** Also a type guard: the data crossed JSON, where NaN and ±Infinity arrive as null. */
const finite = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);

function extent(values: readonly number[]): [number, number] | undefined {
  const v = values.filter((x) => finite(x) && x > 0);
  if (v.length === 0) return undefined;
  return [Math.min(...v), Math.max(...v)];
}

function decadeTicks(min: number, max: number): number[] {
  const out: number[] = [];
  for (let k = Math.ceil(Math.log10(min) - 1e-9); 10 ** k <= max * (1 + 1e-9); k++) out.push(10 ** k);
  return out;
}

function describePole(p: PanelPole, index: number): string[] {
  const im =
    Math.abs(p.s.im) > 1e-9 * Math.abs(p.s.re)
      ? ` ${p.s.im >= 0 ? '+' : '−'} j${formatSi(Math.abs(p.s.im), '')}`
      : '';
  const lines = [
    `pole ${index + 1}: ${formatSi(p.s.re, '')}${im} rad/s`,
    `|p| = ${formatHz(p.hz)}, ζ = ${p.damping.toFixed(3)}`,
    p.namedAfter === 'shared' ? 'no single node holds ≥ 80 %' : `named after node ${p.namedAfter}`,
  ];
  const parts = p.participation
    .filter((q) => q.share >= 0.005)
    .map((q) => `${q.node} ${(100 * q.share).toFixed(1)} %`);
  if (parts.length > 0) lines.push(`participation: ${parts.join(', ')}`);
  return lines;
}

export function commonOptions(colors: ChartColors) {
  return {
    responsive: true,
    maintainAspectRatio: false,
    animation: false as const,
    color: colors.foreground,
    font: { family: colors.fontFamily, size: colors.fontSize },
    interaction: { mode: 'nearest' as const, intersect: true },
    plugins: {
      ampnoteBackground: { color: colors.background },
      legend: {
        position: 'bottom' as const,
        labels: {
          color: colors.foreground,
          boxWidth: 14,
          boxHeight: 2,
          font: { family: colors.fontFamily, size: colors.fontSize - 1 },
        },
      },
      tooltip: {
        backgroundColor: withAlpha(colors.background, 0.95),
        titleColor: colors.foreground,
        bodyColor: colors.foreground,
        borderColor: colors.grid,
        borderWidth: 1,
        titleFont: { family: colors.fontFamily },
        bodyFont: { family: colors.fontFamily },
      },
    },
  };
}

function axis(colors: ChartColors, title: string) {
  return {
    grid: { color: colors.grid },
    border: { color: colors.grid },
    ticks: {
      color: colors.muted,
      font: { family: colors.fontFamily, size: colors.fontSize - 1 },
      maxRotation: 0,
      autoSkipPadding: 10,
    },
    title: {
      display: true,
      text: title,
      color: colors.muted,
      font: { family: colors.fontFamily, size: colors.fontSize - 1 },
    },
  };
}

function line(
  role: DatasetRole,
  label: string,
  data: PlotPoint[],
  color: string,
  extra: Partial<RoleDataset> = {},
): RoleDataset {
  return {
    role,
    label,
    data,
    showLine: true,
    borderColor: color,
    backgroundColor: color,
    borderWidth: 2,
    pointRadius: 0,
    pointHoverRadius: 0,
    pointHitRadius: 0,
    ...extra,
  } as RoleDataset;
}

// ---- (a) pole split -------------------------------------------------------------------------------------

/**
 * The Cc = 0 point sits at the axis' left edge, not at a real abscissa: mark it with a dot and draw the
 * step from it to the first swept value dotted, so it does not read as a measured stretch of the curve.
 */
function uncompensatedStyle(cc: readonly number[]): Partial<RoleDataset> {
  if (cc[0] !== 0) return {};
  return {
    pointRadius: (ctx: { dataIndex: number }) => (ctx.dataIndex === 0 ? 3.5 : 0),
    segment: { borderDash: (ctx: { p0DataIndex: number }) => (ctx.p0DataIndex === 0 ? [2, 3] : undefined) },
  } as Partial<RoleDataset>;
}

/** Where Cc = 0 is drawn: half a decade left of the smallest swept value. */
export function zeroCcEdge(data: PanelData): number | undefined {
  const cc = data.locus.poles.flatMap((s) => s.cc).filter((c) => c > 0);
  if (cc.length === 0) return undefined;
  return Math.min(...cc) / Math.sqrt(10);
}

function locusConfig(data: PanelData, colors: ChartColors): ChartConfiguration<'scatter', PlotPoint[]> {
  const edge = zeroCcEdge(data);
  const datasets: RoleDataset[] = [];
  const px = (cc: number) => (cc > 0 ? cc : (edge ?? cc));
  data.locus.poles.forEach((s, k) => {
    const color = colors.series[k % colors.series.length]!;
    datasets.push(
      line(
        'pole-branch',
        s.label,
        s.cc.map((cc, i) => ({ x: px(cc), y: s.hz[i]!, cc })),
        color,
        { pointHitRadius: 4, ...uncompensatedStyle(s.cc) },
      ),
    );
  });
  data.locus.zeros.forEach((s, k) => {
    datasets.push(
      line(
        'zero-branch',
        s.label,
        s.cc.map((cc, i) => ({ x: px(cc), y: s.hz[i]!, cc, rhp: s.rhp?.[i] })),
        colors.zero,
        {
          borderDash: k % 2 === 0 ? [6, 4] : [2, 3],
          borderWidth: 1.5,
          pointHitRadius: 4,
        },
      ),
    );
  });
  const allHz = [...data.locus.poles, ...data.locus.zeros].flatMap((s) => s.hz);
  const yr = extent(allHz);
  const cc = data.cc;
  if (finite(cc) && cc > 0 && yr) {
    const [lo, hi] = [yr[0] / 3, yr[1] * 3];
    datasets.push(
      line(
        'current-cc',
        `Cc = ${formatSi(cc, 'F')}`,
        [
          { x: cc, y: lo, cc },
          { x: cc, y: hi, cc },
        ],
        withAlpha(colors.marker, 0.7),
        {
          borderDash: [3, 3],
          borderWidth: 1,
        },
      ),
    );
    datasets.push({
      role: 'current-pole',
      label: 'poles at this Cc',
      data: data.poles.map((p) => ({ x: cc, y: p.hz, cc, pole: p })),
      showLine: false,
      pointStyle: 'crossRot',
      pointRadius: 7,
      pointHoverRadius: 9,
      pointHitRadius: 8,
      borderWidth: 2,
      borderColor: colors.marker,
      backgroundColor: colors.marker,
    } as RoleDataset);
    if (data.zeros.length > 0) {
      datasets.push({
        role: 'current-zero',
        label: 'zeros at this Cc',
        data: data.zeros
          .filter((z) => z.hz > 0 && finite(z.hz))
          .map((z) => ({ x: cc, y: z.hz, cc, rhp: z.rhp })),
        showLine: false,
        pointStyle: 'circle',
        pointRadius: 6,
        pointHoverRadius: 8,
        pointHitRadius: 8,
        borderWidth: 2,
        borderColor: colors.zero,
        backgroundColor: 'transparent',
      } as RoleDataset);
    }
  }
  const base = commonOptions(colors);
  return {
    type: 'scatter',
    data: { datasets },
    plugins: [backgroundPlugin],
    options: {
      ...base,
      scales: {
        x: {
          type: 'logarithmic',
          ...axis(colors, 'compensation capacitor Cc (F)'),
          min: edge,
          afterBuildTicks: (scale: Scale) => {
            if (edge === undefined) return;
            const max = scale.max;
            scale.ticks = [{ value: edge }, ...decadeTicks(edge * 2, max).map((value) => ({ value }))];
          },
          ticks: {
            ...axis(colors, '').ticks,
            callback: (v: string | number) =>
              edge !== undefined && Math.abs(Number(v) / edge - 1) < 1e-9 ? '0' : formatSi(Number(v), 'F', 2),
          },
        },
        y: {
          type: 'logarithmic',
          ...axis(colors, 'pole / zero magnitude (Hz)'),
          afterBuildTicks: (scale: Scale) => {
            scale.ticks = decadeTicks(scale.min, scale.max).map((value) => ({ value }));
          },
          ticks: { ...axis(colors, '').ticks, callback: (v: string | number) => formatHz(Number(v), 2) },
        },
      },
      plugins: {
        ...base.plugins,
        tooltip: {
          ...base.plugins.tooltip,
          callbacks: {
            title: (items: TooltipItem<'scatter'>[]) => {
              const p = items[0]?.raw as PlotPoint | undefined;
              return p?.cc === undefined ? '' : `Cc = ${formatSi(p.cc, 'F')}`;
            },
            label: (item: TooltipItem<'scatter'>) => {
              const p = item.raw as PlotPoint;
              const ds = item.dataset as RoleDataset;
              if (p.pole) return describePole(p.pole, item.dataIndex);
              if (ds.role === 'current-cc') return ds.label ?? '';
              const side = p.rhp === undefined ? '' : p.rhp ? ' (right half-plane)' : ' (left half-plane)';
              return `${ds.label}: ${formatHz(p.y)}${side}`;
            },
          },
        },
      },
    },
  } as ChartConfiguration<'scatter', PlotPoint[]>;
}

// ---- (b) loop gain ---------------------------------------------------------------------------------------

function bodeConfig(data: PanelData, colors: ChartColors): ChartConfiguration<'scatter', PlotPoint[]> {
  const b = data.bode;
  const mag = b.hz.map((hz, i) => ({ x: hz, y: b.magDb[i]! }));
  const phase = b.hz.map((hz, i) => ({ x: hz, y: b.phaseDeg[i]! }));
  const datasets: RoleDataset[] = [
    line('magnitude', '|L| (dB)', mag, colors.series[0]!, { yAxisID: 'y' }),
    line('phase', 'phase of L (°)', phase, colors.series[1]!, { yAxisID: 'phase', borderWidth: 1.5 }),
  ];
  const dbs = b.magDb.filter(finite);
  if (b.hz.length > 0) {
    datasets.push(
      line(
        'phase-reference',
        '−180°',
        [
          { x: b.hz[0]!, y: -180 },
          { x: b.hz[b.hz.length - 1]!, y: -180 },
        ],
        withAlpha(colors.series[1]!, 0.45),
        {
          yAxisID: 'phase',
          borderDash: [2, 4],
          borderWidth: 1,
        },
      ),
    );
  }
  // Every unity crossing, not only the last: a loop that crosses three times can look healthy at the first.
  const crossings = b.crossings.filter((c) => finite(c.hz));
  if (crossings.length > 0) {
    datasets.push({
      role: 'crossing',
      label: crossings.length === 1 ? 'unity crossing' : `unity crossings (${crossings.length})`,
      data: crossings.map((c) => ({ x: c.hz, y: 0 })),
      yAxisID: 'y',
      showLine: false,
      pointStyle: 'circle',
      pointRadius: 4,
      pointHoverRadius: 4,
      pointHitRadius: 0,
      borderWidth: 2,
      borderColor: colors.marker,
      backgroundColor: colors.background,
    } as RoleDataset);
  }
  if (finite(b.ugfHz) && dbs.length > 0) {
    datasets.push(
      line(
        'ugf',
        `UGF ${formatHz(b.ugfHz)}`,
        [
          { x: b.ugfHz, y: Math.min(...dbs) },
          { x: b.ugfHz, y: Math.max(...dbs) },
        ],
        withAlpha(colors.marker, 0.7),
        {
          yAxisID: 'y',
          borderDash: [3, 3],
          borderWidth: 1,
        },
      ),
    );
    if (finite(b.phaseMarginDeg)) {
      datasets.push(
        line(
          'phase-margin',
          `PM ${formatDeg(b.phaseMarginDeg)}`,
          [
            { x: b.ugfHz, y: -180 },
            { x: b.ugfHz, y: b.phaseMarginDeg - 180 },
          ],
          colors.band,
          {
            yAxisID: 'phase',
            borderWidth: 4,
            pointRadius: 3,
            pointStyle: 'line',
          },
        ),
      );
    }
  }
  const base = commonOptions(colors);
  const hzTicks = (scale: Scale) => {
    scale.ticks = decadeTicks(scale.min, scale.max).map((value) => ({ value }));
  };
  return {
    type: 'scatter',
    data: { datasets },
    plugins: [backgroundPlugin],
    options: {
      ...base,
      interaction: { mode: 'index', intersect: false, axis: 'x' },
      scales: {
        x: {
          type: 'logarithmic',
          ...axis(colors, 'frequency (Hz)'),
          min: b.hz[0],
          max: b.hz[b.hz.length - 1],
          afterBuildTicks: hzTicks,
          ticks: { ...axis(colors, '').ticks, callback: (v: string | number) => formatHz(Number(v), 2) },
        },
        y: { type: 'linear', position: 'left', ...axis(colors, 'loop gain (dB)') },
        phase: {
          type: 'linear',
          position: 'right',
          ...axis(colors, 'phase (°)'),
          grid: { drawOnChartArea: false, color: colors.grid },
          ticks: { ...axis(colors, '').ticks, stepSize: 45 },
        },
      },
      plugins: {
        ...base.plugins,
        tooltip: {
          ...base.plugins.tooltip,
          filter: (item: TooltipItem<'scatter'>) => {
            const role = (item.dataset as RoleDataset).role;
            return role === 'magnitude' || role === 'phase';
          },
          callbacks: {
            title: (items: TooltipItem<'scatter'>[]) =>
              items[0] ? formatHz((items[0].raw as PlotPoint).x) : '',
            label: (item: TooltipItem<'scatter'>) => {
              const p = item.raw as PlotPoint;
              return (item.dataset as RoleDataset).role === 'magnitude'
                ? `|L| ${p.y.toFixed(2)} dB`
                : `phase ${p.y.toFixed(1)}°`;
            },
          },
        },
      },
    },
  } as ChartConfiguration<'scatter', PlotPoint[]>;
}

// ---- (c) closed-loop step ----------------------------------------------------------------------------------

/** Half-height of the zoomed step view, in band widths either side of the final value. */
export const BAND_ZOOM = 6;

function stepConfig(
  data: PanelData,
  colors: ChartColors,
  options: DrawOptions,
): ChartConfiguration<'scatter', PlotPoint[]> {
  const st = data.step;
  const ls = st.largeSignal;
  const t0 = st.t[0] ?? 0;
  // The large-signal step may take longer: the axis spans both.
  const t1 = Math.max(st.t[st.t.length - 1] ?? 1, ls?.t[ls.t.length - 1] ?? -Infinity);
  const datasets: RoleDataset[] = [
    line(
      'step',
      ls ? 'small-signal (V per V of input step)' : 'output (V per V of input step)',
      st.t.map((t, i) => ({ x: t, y: st.y[i]! })),
      colors.series[0]!,
    ),
  ];
  if (ls) {
    datasets.push(
      line(
        'large-signal-step',
        `large-signal, ${formatSi(ls.amplitude, 'V')} step (per V)`,
        ls.t.map((t, i) => ({ x: t, y: ls.y[i]! })),
        colors.series[1]!,
        { borderWidth: 2 },
      ),
    );
  }
  // An unstable loop has no final value to settle to: no band, no settling mark.
  if (st.t.length > 0 && finite(st.final) && st.stable !== false) {
    const band = Math.abs(st.final) * st.tolerance;
    const bandColor = withAlpha(colors.band, 0.8);
    datasets.push(
      line(
        'band-low',
        `±${(100 * st.tolerance).toPrecision(2)} % band`,
        [
          { x: t0, y: st.final - band },
          { x: t1, y: st.final - band },
        ],
        bandColor,
        {
          borderWidth: 1,
          borderDash: [4, 3],
        },
      ),
      line(
        'band-high',
        'band (upper)',
        [
          { x: t0, y: st.final + band },
          { x: t1, y: st.final + band },
        ],
        bandColor,
        {
          borderWidth: 1,
          borderDash: [4, 3],
          fill: '-1',
          backgroundColor: withAlpha(colors.band, 0.18),
        },
      ),
    );
  }
  if (typeof st.settlingTime === 'number' && st.y.length > 0) {
    const ys = st.y.filter(finite);
    datasets.push(
      line(
        'settling',
        `settled at ${formatSi(st.settlingTime, 's')}`,
        [
          { x: st.settlingTime, y: Math.min(0, ...ys) },
          { x: st.settlingTime, y: Math.max(...ys) },
        ],
        withAlpha(colors.marker, 0.55),
        {
          borderWidth: 1,
        },
      ),
    );
  }
  const settles = st.t.length > 0 && finite(st.final) && st.stable !== false;
  const marks: SettlingMarks = {
    show: settles,
    inset: !options.stepBandZoom,
    final: st.final,
    band: Math.abs(st.final) * st.tolerance,
    ...(typeof st.settlingTime === 'number'
      ? { settlingTime: st.settlingTime, timeText: formatSi(st.settlingTime, 's') }
      : {}),
    bandText: `±${(100 * st.tolerance).toPrecision(2)} %`,
    colors: {
      curve: colors.series[0]!,
      band: colors.band,
      bandFill: withAlpha(colors.band, 0.24),
      marker: withAlpha(colors.marker, 0.55),
      text: colors.foreground,
      muted: colors.muted,
      grid: withAlpha(colors.marker, 0.3),
      background: colors.background,
      fontFamily: colors.fontFamily,
      fontSize: colors.fontSize,
    },
  };
  const base = commonOptions(colors);
  return {
    type: 'scatter',
    data: { datasets },
    plugins: [backgroundPlugin, spanShadePlugin, settlingMarksPlugin],
    options: {
      ...base,
      // With a large-signal step the two lines are sampled at different times: the nearest point along x.
      interaction: { mode: ls ? 'nearest' : 'index', intersect: false, axis: 'x' },
      scales: {
        x: {
          type: 'linear',
          ...axis(colors, 'time (s)'),
          min: t0,
          max: t1,
          ticks: {
            ...axis(colors, '').ticks,
            maxTicksLimit: 7,
            callback: (v: string | number) => formatSi(Number(v), 's', 2),
          },
        },
        y: { type: 'linear', ...axis(colors, 'output'), ...bandZoom(data, options) },
      },
      plugins: {
        ...base.plugins,
        ampnoteSettling: marks,
        // Where the large-signal step slews (a stage at more than 90 % of its bias).
        ampnoteSpans: {
          ranges: (ls?.slewing ?? []).map((r) => ({ from: r.start, to: r.end })),
          color: withAlpha(colors.series[1]!, 0.14),
        },
        legend: {
          ...base.plugins.legend,
          labels: {
            ...base.plugins.legend.labels,
            // The settling instant is labelled on the chart itself.
            filter: (item: { datasetIndex?: number }) => {
              const role = datasets[item.datasetIndex ?? -1]?.role;
              return role !== 'band-high' && role !== 'settling';
            },
          },
        },
        tooltip: {
          ...base.plugins.tooltip,
          filter: (item: TooltipItem<'scatter'>) => {
            const role = (item.dataset as RoleDataset).role;
            return role === 'step' || role === 'large-signal-step';
          },
          callbacks: {
            title: (items: TooltipItem<'scatter'>[]) =>
              items[0] ? formatSi((items[0].raw as PlotPoint).x, 's') : '',
            label: (item: TooltipItem<'scatter'>) => {
              const p = item.raw as PlotPoint;
              if ((item.dataset as RoleDataset).role === 'step') return `output ${p.y.toPrecision(5)}`;
              const slewing = (ls?.slewing ?? []).some((r) => p.x >= r.start && p.x <= r.end);
              return `large-signal ${p.y.toPrecision(5)} per V (${formatSi(p.y * (ls?.amplitude ?? 1), 'V')})${slewing ? ', slewing' : ''}`;
            },
          },
        },
      },
    },
  } as ChartConfiguration<'scatter', PlotPoint[]>;
}

// ---- (d) s-plane ---------------------------------------------------------------------------------------

/** The knee of the symmetric log axes of the s-plane map (rad/s), shared by both axes. */
export function splaneKnee(data: PanelData): number {
  return symlogKnee(
    [...data.poles.map((p) => p.s), ...data.zeros.map((z) => z.s), ...(data.closedLoopPoles ?? [])].flatMap(
      (s) => [s.re, s.im],
    ),
  );
}

function splaneConfig(data: PanelData, colors: ChartColors): ChartConfiguration<'scatter', PlotPoint[]> {
  const v0 = splaneKnee(data);
  const pt = (re: number, im: number) => ({ x: symlog(re, v0), y: symlog(im, v0), re, im });
  const zeros = data.zeros.filter((z) => finite(z.s.re) && finite(z.s.im));
  const datasets: RoleDataset[] = [
    {
      role: 'pole',
      label: 'open-loop poles ×',
      data: data.poles.map((p) => ({ ...pt(p.s.re, p.s.im), pole: p })),
      showLine: false,
      pointStyle: 'crossRot',
      pointRadius: 8,
      pointHoverRadius: 10,
      pointHitRadius: 8,
      borderWidth: 2.5,
      borderColor: colors.series[0],
      backgroundColor: colors.series[0],
    } as RoleDataset,
    {
      role: 'zero',
      label: 'zeros ○',
      data: zeros.map((z) => ({ ...pt(z.s.re, z.s.im), rhp: z.rhp })),
      showLine: false,
      pointStyle: 'circle',
      pointRadius: 7,
      pointHoverRadius: 9,
      pointHitRadius: 8,
      borderWidth: 2,
      borderColor: colors.zero,
      backgroundColor: 'transparent',
    } as RoleDataset,
    {
      role: 'closed-pole',
      label: 'closed-loop poles ◇',
      data: (data.closedLoopPoles ?? [])
        .filter((s) => finite(s.re) && finite(s.im))
        .map((s) => ({ ...pt(s.re, s.im), closed: true })),
      showLine: false,
      pointStyle: 'rectRot',
      pointRadius: 6,
      pointHoverRadius: 8,
      pointHitRadius: 8,
      borderWidth: 2,
      borderColor: colors.band,
      backgroundColor: 'transparent',
    } as RoleDataset,
  ];
  const xs = datasets.flatMap((d) => d.data.map((p) => p.x));
  const ys = datasets.flatMap((d) => d.data.map((p) => Math.abs(p.y)));
  const xMin = Math.min(-1, ...xs) - 0.5;
  const xMax = Math.max(1, ...xs) + 0.5;
  const yMax = Math.max(1, ...ys) + 0.5;
  const maxAbs = symlogInverse(Math.max(-xMin, xMax, yMax), v0);
  const ticks = symlogTicks(v0, maxAbs);
  const label = (t: number) => {
    const v = symlogInverse(t, v0);
    return Math.abs(t) < 1e-12 ? '0' : formatSi(v, '', 1);
  };
  const base = commonOptions(colors);
  const symAxis = (title: string, min: number, max: number) => ({
    type: 'linear' as const,
    ...axis(colors, title),
    min,
    max,
    afterBuildTicks: (scale: Scale) => {
      scale.ticks = ticks.filter((t) => t >= min && t <= max).map((value) => ({ value }));
    },
    ticks: { ...axis(colors, '').ticks, callback: (v: string | number) => label(Number(v)) },
    grid: {
      color: (ctx: { tick?: { value: number } }) =>
        ctx.tick && Math.abs(ctx.tick.value) < 1e-12 ? withAlpha(colors.foreground, 0.6) : colors.grid,
    },
  });
  return {
    type: 'scatter',
    data: { datasets },
    plugins: [backgroundPlugin],
    options: {
      ...base,
      scales: {
        x: symAxis('Re s (rad/s)', xMin, xMax),
        y: symAxis('Im s (rad/s)', -yMax, yMax),
      },
      plugins: {
        ...base.plugins,
        tooltip: {
          ...base.plugins.tooltip,
          callbacks: {
            label: (item: TooltipItem<'scatter'>) => {
              const p = item.raw as PlotPoint;
              if (p.pole) return describePole(p.pole, item.dataIndex);
              const hz = modulusHz({ re: p.re ?? 0, im: p.im ?? 0 });
              if (p.closed) {
                return [
                  `closed-loop pole: ${formatSi(p.re ?? 0, '')} ${(p.im ?? 0) >= 0 ? '+' : '−'} j${formatSi(Math.abs(p.im ?? 0), '')} rad/s`,
                  `|p| = ${formatHz(hz)}${(p.re ?? 0) > 0 ? ', right half-plane: the loop is unstable' : ''}`,
                ];
              }
              return [
                `zero: ${formatSi(p.re ?? 0, '')} ${(p.im ?? 0) >= 0 ? '+' : '−'} j${formatSi(Math.abs(p.im ?? 0), '')} rad/s`,
                `|z| = ${formatHz(hz)}${p.rhp ? ', right half-plane' : ''}`,
              ];
            },
          },
        },
      },
    },
  } as ChartConfiguration<'scatter', PlotPoint[]>;
}

function bandZoom(data: PanelData, options: DrawOptions): { min?: number; max?: number } {
  const band = Math.abs(data.step.final) * data.step.tolerance;
  if (!options.stepBandZoom || !(band > 0) || data.step.t.length === 0) return {};
  return { min: data.step.final - BAND_ZOOM * band, max: data.step.final + BAND_ZOOM * band };
}

const KIT: ChartKit = {
  backgroundPlugin,
  axis,
  commonOptions,
  line,
  decadeTicks,
  empty: (colors) => ({
    type: 'scatter',
    data: { datasets: [] },
    plugins: [backgroundPlugin],
    options: commonOptions(colors),
  }),
};

const BUILDERS: Record<
  ChartId,
  (d: PanelData, c: ChartColors, o: DrawOptions) => ChartConfiguration<'scatter', PlotPoint[]>
> = {
  locus: locusConfig,
  bode: bodeConfig,
  step: stepConfig,
  splane: splaneConfig,
  'sweep-margins': (d, c, o) => sweepMarginsConfig(KIT, d, c, o.sweep ?? 0),
  'sweep-locus': (d, c, o) => sweepLocusConfig(KIT, d, c, o.sweep ?? 0),
  zout: (d, c) => zoutConfig(KIT, d, c),
  'load-step': (d, c) => loadStepConfig(KIT, d, c),
  'supply-rejection': (d, c) => supplyRejectionConfig(KIT, d, c),
};

/** The canvas for a chart: `#chart-<id>` inside root, created (in a sized box) when the page has none. */
function canvasFor(root: ParentNode, id: ChartId): HTMLCanvasElement {
  const found = root.querySelector<HTMLCanvasElement>(`#chart-${id}`);
  if (found) return found;
  const box = document.createElement('div');
  box.className = 'canvas-box';
  box.style.position = 'relative';
  box.style.height = '280px';
  const canvas = document.createElement('canvas');
  canvas.id = `chart-${id}`;
  box.appendChild(canvas);
  (root as Element).appendChild(box);
  return canvas;
}

/**
 * Draws (or redraws in place) the charts from one PanelData: every chart in the table, except those only
 * for some designs that this design lacks (presence.ts). Returns the Chart objects, keyed by chart, so
 * callers can export them and tests can read back what is drawn.
 */
export function drawCharts(root: ParentNode, data: PanelData, options: DrawOptions): ChartSet {
  const out = {} as ChartSet;
  for (const id of CHART_IDS) {
    if (chartAbsent(id, data)) {
      options.previous?.[id]?.destroy();
      continue;
    }
    const existing = options.previous?.[id];
    out[id] = drawChart(
      existing && existing.canvas && existing.canvas.isConnected ? existing : canvasFor(root, id),
      id,
      data,
      options,
    );
  }
  return out;
}

/** One chart into a canvas (a new Chart), or into a Chart already drawn there (updated in place). */
export function drawChart(
  into: HTMLCanvasElement | Chart<'scatter', PlotPoint[]>,
  id: ChartId,
  data: PanelData,
  options: DrawOptions,
): Chart<'scatter', PlotPoint[]> {
  const config = BUILDERS[id](data, options.colors, options);
  if (into instanceof Chart) {
    into.data = config.data;
    into.options = config.options ?? {};
    into.update('none');
    return into;
  }
  Chart.getChart(into)?.destroy();
  return new Chart(into, config);
}

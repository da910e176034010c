// The two charts of a sweep: the loop's margins against the swept parameter (one line per corner, the
// requirements as lines, failing stretches shaded) and the nominal corner's poles and zeros followed
// along the sweep in the complex plane. Configurations only; draw.ts registers and draws them.
import type { ChartConfiguration, Plugin, Scale, TooltipItem } from 'chart.js';
import { spanShadePlugin, type SpanShade } from './spanShade';
import { SWEEP_QUANTITY } from '../sweep/quantities';
import type { PanelData, PanelSweep, SweepQuantity } from '../protocol/panelData';
import { formatDeg, formatHz, formatSi } from '../format/si';
import { modulusHz } from '../numeric/complex';
import { withAlpha, type ChartColors } from './colors';
import { selectedSweep } from './presence';
import { symlog, symlogInverse, symlogKnee, symlogTicks } from './symlog';
import type { DatasetRole, PlotPoint, RoleDataset } from './draw';

/** The helpers every chart of draw.ts is built with, handed over so that the two modules share them. */
export interface ChartKit {
  readonly backgroundPlugin: Plugin<'scatter'>;
  axis(colors: ChartColors, title: string): Record<string, unknown> & { ticks: Record<string, unknown> };
  commonOptions(colors: ChartColors): ReturnType<typeof import('./draw').commonOptions>;
  line(
    role: DatasetRole,
    label: string,
    data: PlotPoint[],
    color: string,
    extra?: Partial<RoleDataset>,
  ): RoleDataset;
  decadeTicks(min: number, max: number): number[];
  /** Axes without data, for a chart that has nothing to draw for this design. */
  empty(colors: ChartColors): ChartConfiguration<'scatter', PlotPoint[]>;
}

type Config = ChartConfiguration<'scatter', PlotPoint[]>;

const AXIS: Record<SweepQuantity, string> = { phaseMarginDeg: 'pm', ugfHz: 'ugf', gainMarginDb: 'gm' };
const ROLE = { phaseMarginDeg: 'sweep-pm', ugfHz: 'sweep-ugf', gainMarginDb: 'sweep-gm' } as const;

/** A value of the swept parameter for people. */
export const sweptText = (sw: PanelSweep, x: number) =>
  sw.unit ? formatSi(x, sw.unit) : String(Number(x.toPrecision(3)));

/** Ticks at whole decades when the axis spans a few; within a decade or two, chart.js' own ticks read better. */
const decadesWhenWide = (kit: ChartKit) => (scale: Scale) => {
  const decades = kit.decadeTicks(scale.min, scale.max);
  if (decades.length >= 3) scale.ticks = decades.map((value) => ({ value }));
  // chart.js' own logarithmic ticks crowd a narrow axis (1.2, 1.4, 1.6 … MHz): keep about five.
  else if (scale.ticks.length > 6) {
    const every = Math.ceil(scale.ticks.length / 5);
    scale.ticks = scale.ticks.filter((_, i) => i % every === 0);
  }
};

/**
 * The legend says once what a colour and a dash mean (a corner; a quantity) instead of one entry per line,
 * which with three quantities per corner would crowd out the chart.
 */
function legendLabels(sw: PanelSweep, colors: ChartColors, datasets: readonly RoleDataset[]) {
  const item = (text: string, stroke: string, dash: number[], datasetIndex?: number) => ({
    text,
    fillStyle: stroke,
    strokeStyle: stroke,
    fontColor: colors.foreground,
    lineDash: dash,
    lineWidth: 2,
    hidden: false,
    ...(datasetIndex !== undefined ? { datasetIndex } : {}),
  });
  const quantities = (['phaseMarginDeg', 'gainMarginDb', 'ugfHz'] as const).filter((q) =>
    datasets.some((d) => d.role === ROLE[q]),
  );
  const dash: Record<SweepQuantity, number[]> = { phaseMarginDeg: [], gainMarginDb: [6, 4], ugfHz: [2, 3] };
  return [
    ...(sw.corners.length > 1
      ? sw.corners.map((c, k) => item(c.corner, colors.series[k % colors.series.length]!, []))
      : []),
    ...quantities.map((q) =>
      item(SWEEP_QUANTITY[q].short, sw.corners.length > 1 ? colors.muted : colors.series[0]!, dash[q]),
    ),
    ...datasets.flatMap((d, i) =>
      d.role === 'sweep-requirement' || d.role === 'sweep-worst'
        ? [item(d.label ?? '', String(d.borderColor), (d.borderDash as number[] | undefined) ?? [], i)]
        : [],
    ),
  ];
}

function sweptAxis(kit: ChartKit, colors: ChartColors, sw: PanelSweep) {
  const title = sw.unit ? `${sw.param} (${sw.unit})` : sw.param;
  return {
    type: sw.scale === 'log' ? ('logarithmic' as const) : ('linear' as const),
    ...kit.axis(colors, title),
    min: sw.values[0],
    max: sw.values[sw.values.length - 1],
    ...(sw.scale === 'log' ? { afterBuildTicks: decadesWhenWide(kit) } : {}),
    ticks: {
      ...kit.axis(colors, '').ticks,
      callback: (v: string | number) => (sw.unit ? formatSi(Number(v), sw.unit, 2) : String(Number(v))),
    },
  };
}

export function sweepMarginsConfig(
  kit: ChartKit,
  data: PanelData,
  colors: ChartColors,
  sweep: number,
): Config {
  const sw = selectedSweep(data, sweep);
  const datasets: RoleDataset[] = [];
  if (!sw) return kit.empty(colors);
  const several = sw.corners.length > 1;
  sw.corners.forEach((c, k) => {
    const color = colors.series[k % colors.series.length]!;
    const style: Record<SweepQuantity, Partial<RoleDataset>> = {
      phaseMarginDeg: {},
      gainMarginDb: { borderDash: [6, 4], borderWidth: 1.5 },
      ugfHz: { borderDash: [2, 3], borderWidth: 1.5 },
    };
    for (const q of ['phaseMarginDeg', 'ugfHz', 'gainMarginDb'] as const) {
      const ys = c[q];
      if (!ys.some((y) => y !== null)) continue;
      datasets.push(
        kit.line(
          ROLE[q],
          `${SWEEP_QUANTITY[q].short}${several ? ` ${c.corner}` : ''}`,
          // A value not computed there (no unity crossing, an unbounded gain margin) is a gap in the line.
          sw.values.map((x, i) => ({ x, y: ys[i] ?? NaN, swept: x, corner: c.corner })),
          color,
          { yAxisID: AXIS[q], ...style[q] },
        ),
      );
    }
  });
  const first = sw.values[0]!;
  const last = sw.values[sw.values.length - 1]!;
  for (const r of sw.requirements) {
    datasets.push(
      kit.line(
        'sweep-requirement',
        r.label,
        [
          { x: first, y: r.value },
          { x: last, y: r.value },
        ],
        withAlpha(colors.zero, 0.85),
        { yAxisID: AXIS[r.quantity], borderDash: [8, 4], borderWidth: 1 },
      ),
    );
  }
  const worst = sw.worstPhaseMargin;
  if (worst) {
    datasets.push({
      role: 'sweep-worst',
      label: `lowest PM ${formatDeg(worst.value)} at ${sweptText(sw, worst.at)}${several ? ` (${worst.corner})` : ''}`,
      data: [{ x: worst.at, y: worst.value, swept: worst.at, corner: worst.corner }],
      yAxisID: 'pm',
      showLine: false,
      pointStyle: 'triangle',
      pointRadius: 6,
      pointHoverRadius: 7,
      pointHitRadius: 6,
      borderWidth: 2,
      borderColor: colors.marker,
      backgroundColor: 'transparent',
    } as RoleDataset);
  }
  const has = (q: SweepQuantity) => datasets.some((d) => d.yAxisID === AXIS[q]);
  const base = kit.commonOptions(colors);
  const failing: SpanShade = { ranges: sw.failing, color: withAlpha(colors.zero, 0.13) };
  const valueOf = (item: TooltipItem<'scatter'>) => {
    const role = (item.dataset as RoleDataset).role;
    const q = (Object.keys(ROLE) as SweepQuantity[]).find((k) => ROLE[k] === role);
    const p = item.raw as PlotPoint;
    return q
      ? `${p.corner && several ? `${p.corner}: ` : ''}${SWEEP_QUANTITY[q].short} ${SWEEP_QUANTITY[q].text(p.y)}`
      : '';
  };
  return {
    type: 'scatter',
    data: { datasets },
    plugins: [kit.backgroundPlugin, spanShadePlugin],
    options: {
      ...base,
      interaction: { mode: 'index', intersect: false, axis: 'x' },
      scales: {
        x: sweptAxis(kit, colors, sw),
        pm: {
          type: 'linear',
          position: 'left',
          display: has('phaseMarginDeg'),
          ...kit.axis(colors, 'phase margin (°)'),
        },
        gm: {
          type: 'linear',
          position: 'right',
          display: has('gainMarginDb'),
          ...kit.axis(colors, 'gain margin (dB)'),
          grid: { drawOnChartArea: false, color: colors.grid },
        },
        ugf: {
          type: 'logarithmic',
          position: 'right',
          display: has('ugfHz'),
          ...kit.axis(colors, 'UGF (Hz)'),
          grid: { drawOnChartArea: false, color: colors.grid },
          afterBuildTicks: decadesWhenWide(kit),
          ticks: {
            ...kit.axis(colors, '').ticks,
            maxTicksLimit: 6,
            callback: (v: string | number) => formatHz(Number(v), 2),
          },
        },
      },
      plugins: {
        ...base.plugins,
        ampnoteSpans: failing,
        legend: {
          ...base.plugins.legend,
          // Entries stand for groups of lines, so clicking one hides nothing.
          onClick: () => undefined,
          labels: { ...base.plugins.legend.labels, generateLabels: () => legendLabels(sw, colors, datasets) },
        },
        tooltip: {
          ...base.plugins.tooltip,
          filter: (item: TooltipItem<'scatter'>) =>
            Number.isFinite((item.raw as PlotPoint).y) &&
            (Object.values(ROLE) as string[]).includes((item.dataset as RoleDataset).role),
          callbacks: {
            title: (items: TooltipItem<'scatter'>[]) =>
              items[0] ? `${sw.param} = ${sweptText(sw, (items[0].raw as PlotPoint).x)}` : '',
            label: valueOf,
            footer: (items: TooltipItem<'scatter'>[]) => {
              const x = (items[0]?.raw as PlotPoint | undefined)?.x;
              if (x === undefined) return '';
              const fails = sw.failing.filter((r) => x >= r.from && x <= r.to).map((r) => r.label);
              return fails.length ? `fails here: ${[...new Set(fails)].join(', ')}` : '';
            },
          },
        },
      },
    },
  } as Config;
}

/** The knee of the locus chart's symmetric log axes (rad/s), from every root along the sweep. */
export function sweepLocusKnee(sw: PanelSweep): number {
  return symlogKnee(sw.locus.flatMap((t) => t.s.flatMap((s) => [s.re, s.im])));
}

export function sweepLocusConfig(kit: ChartKit, data: PanelData, colors: ChartColors, sweep: number): Config {
  const sw = selectedSweep(data, sweep);
  if (!sw) return kit.empty(colors);
  const v0 = sweepLocusKnee(sw);
  const pt = (re: number, im: number, swept: number, kind: 'pole' | 'zero') => ({
    x: symlog(re, v0),
    y: symlog(im, v0),
    re,
    im,
    swept,
    kind,
  });
  const datasets: RoleDataset[] = [];
  let poleLegend = false;
  let zeroLegend = false;
  for (const t of sw.locus) {
    const pole = t.kind === 'pole';
    const shown = pole ? !poleLegend : !zeroLegend;
    if (pole) poleLegend = true;
    else zeroLegend = true;
    datasets.push(
      kit.line(
        pole ? 'sweep-pole-track' : 'sweep-zero-track',
        shown ? (pole ? 'poles along the sweep' : 'zeros along the sweep') : '',
        t.s.map((s, i) => pt(s.re, s.im, t.values[i]!, t.kind)),
        pole ? colors.series[0]! : colors.zero,
        {
          borderWidth: pole ? 2 : 1.5,
          ...(pole ? {} : { borderDash: [6, 4] }),
          pointRadius: 1.5,
          pointHoverRadius: 5,
          pointHitRadius: 5,
        },
      ),
    );
  }
  const ends = (which: 'start' | 'end') =>
    sw.locus.flatMap((t) => {
      const i = which === 'start' ? 0 : t.s.length - 1;
      const s = t.s[i];
      return s ? [pt(s.re, s.im, t.values[i]!, t.kind)] : [];
    });
  datasets.push(
    {
      role: 'sweep-start',
      label: `${sw.param} = ${sweptText(sw, sw.values[0]!)}`,
      data: ends('start'),
      showLine: false,
      pointStyle: 'circle',
      pointRadius: 5,
      pointHoverRadius: 7,
      pointHitRadius: 6,
      borderWidth: 2,
      borderColor: colors.marker,
      backgroundColor: 'transparent',
    } as RoleDataset,
    {
      role: 'sweep-end',
      label: `${sw.param} = ${sweptText(sw, sw.values[sw.values.length - 1]!)}`,
      data: ends('end'),
      showLine: false,
      pointStyle: 'crossRot',
      pointRadius: 7,
      pointHoverRadius: 9,
      pointHitRadius: 6,
      borderWidth: 2,
      borderColor: colors.marker,
      backgroundColor: colors.marker,
    } as RoleDataset,
  );
  const xs = datasets.flatMap((d) => d.data.map((p) => p.x));
  const ys = datasets.flatMap((d) => d.data.map((p) => Math.abs(p.y)));
  const xMin = Math.min(-1, ...xs) - 0.5;
  const xMax = Math.max(1, ...xs) + 0.5;
  const yMax = Math.max(1, ...ys) + 0.5;
  const ticks = symlogTicks(v0, symlogInverse(Math.max(-xMin, xMax, yMax), v0));
  const label = (t: number) => (Math.abs(t) < 1e-12 ? '0' : formatSi(symlogInverse(t, v0), '', 1));
  const symAxis = (title: string, min: number, max: number) => ({
    type: 'linear' as const,
    ...kit.axis(colors, title),
    min,
    max,
    afterBuildTicks: (scale: Scale) => {
      scale.ticks = ticks.filter((t) => t >= min && t <= max).map((value) => ({ value }));
    },
    ticks: { ...kit.axis(colors, '').ticks, callback: (v: string | number) => label(Number(v)) },
    grid: {
      color: (ctx: { tick?: { value: number } }) =>
        ctx.tick && Math.abs(ctx.tick.value) < 1e-12 ? withAlpha(colors.foreground, 0.6) : colors.grid,
    },
  });
  const base = kit.commonOptions(colors);
  return {
    type: 'scatter',
    data: { datasets },
    plugins: [kit.backgroundPlugin],
    options: {
      ...base,
      interaction: { mode: 'nearest', intersect: true },
      scales: { x: symAxis('Re s (rad/s)', xMin, xMax), y: symAxis('Im s (rad/s)', -yMax, yMax) },
      plugins: {
        ...base.plugins,
        legend: {
          ...base.plugins.legend,
          labels: { ...base.plugins.legend.labels, filter: (item: { text?: string }) => !!item.text },
        },
        tooltip: {
          ...base.plugins.tooltip,
          callbacks: {
            title: (items: TooltipItem<'scatter'>[]) => {
              const p = items[0]?.raw as PlotPoint | undefined;
              return p?.swept === undefined ? '' : `${sw.param} = ${sweptText(sw, p.swept)}`;
            },
            label: (item: TooltipItem<'scatter'>) => {
              const p = item.raw as PlotPoint;
              const re = p.re ?? 0;
              const im = p.im ?? 0;
              return [
                `${p.kind ?? 'root'}: ${formatSi(re, '')} ${im >= 0 ? '+' : '−'} j${formatSi(Math.abs(im), '')} rad/s`,
                `|s| = ${formatHz(modulusHz({ re, im }))}${re > 0 ? ', right half-plane' : ''}`,
              ];
            },
          },
        },
      },
    },
  } as Config;
}

// The charts of a loop closed by the design's own elements (`feedback at`): output impedance and supply
// rejection against frequency, and the output's response to a load-current step. Configurations only;
// draw.ts draws them with the shared helpers (ChartKit).
import type { ChartConfiguration, Scale, TooltipItem } from 'chart.js';
import type { PanelData } from '../protocol/panelData';
import { formatHz, formatSi } from '../format/si';
import type { ChartColors } from './colors';
import type { PlotPoint, RoleDataset } from './draw';
import type { ChartKit } from './sweepCharts';

type Config = ChartConfiguration<'scatter', PlotPoint[]>;

/** A frequency axis with a tick per decade. */
function hzAxis(kit: ChartKit, colors: ChartColors, hz: readonly number[]) {
  return {
    type: 'logarithmic' as const,
    ...kit.axis(colors, 'frequency (Hz)'),
    min: hz[0],
    max: hz[hz.length - 1],
    afterBuildTicks: (scale: Scale) => {
      scale.ticks = kit.decadeTicks(scale.min, scale.max).map((value) => ({ value }));
    },
    ticks: { ...kit.axis(colors, '').ticks, callback: (v: string | number) => formatHz(Number(v), 2) },
  };
}

/** A chart of lines against one x axis, with the x value as the tooltip's title (index mode). */
function lineChart(
  kit: ChartKit,
  colors: ChartColors,
  datasets: RoleDataset[],
  x: Record<string, unknown>,
  y: Record<string, unknown>,
  title: (x: number) => string,
  value: (item: TooltipItem<'scatter'>) => string,
): Config {
  const base = kit.commonOptions(colors);
  return {
    type: 'scatter',
    data: { datasets },
    plugins: [kit.backgroundPlugin],
    options: {
      ...base,
      interaction: { mode: 'index', intersect: false, axis: 'x' },
      scales: { x, y },
      plugins: {
        ...base.plugins,
        tooltip: {
          ...base.plugins.tooltip,
          callbacks: {
            title: (items: TooltipItem<'scatter'>[]) =>
              items[0] ? title((items[0].raw as PlotPoint).x) : '',
            label: value,
          },
        },
      },
    },
  } as Config;
}

/** A line chart against frequency. */
const frequencyChart = (
  kit: ChartKit,
  colors: ChartColors,
  hz: readonly number[],
  datasets: RoleDataset[],
  y: Record<string, unknown>,
  value: (item: TooltipItem<'scatter'>) => string,
): Config => lineChart(kit, colors, datasets, hzAxis(kit, colors, hz), y, (f) => formatHz(f), value);

export function zoutConfig(kit: ChartKit, data: PanelData, colors: ChartColors): Config {
  const c = data.closedCircuit;
  if (!c) return kit.empty(colors);
  const datasets = [
    kit.line(
      'zout',
      '|Zout|',
      c.hz.map((f, i) => ({ x: f, y: c.zoutOhm[i]! })),
      colors.series[0]!,
    ),
  ];
  const y = {
    type: 'logarithmic',
    ...kit.axis(colors, '|Zout| (Ω)'),
    ticks: { ...kit.axis(colors, '').ticks, callback: (v: string | number) => formatSi(Number(v), 'ohm', 2) },
  };
  return frequencyChart(
    kit,
    colors,
    c.hz,
    datasets,
    y,
    (item) => `|Zout| ${formatSi((item.raw as PlotPoint).y, 'ohm')}`,
  );
}

export function supplyRejectionConfig(kit: ChartKit, data: PanelData, colors: ChartColors): Config {
  const c = data.closedCircuit;
  if (!c) return kit.empty(colors);
  const datasets = c.supplies.map((s, k) =>
    kit.line(
      'supply-rejection',
      s.node,
      c.hz.map((f, i) => ({ x: f, y: s.rejectionDb[i]! })),
      colors.series[k % colors.series.length]!,
    ),
  );
  const y = { type: 'linear', ...kit.axis(colors, 'rejection (dB)') };
  return frequencyChart(
    kit,
    colors,
    c.hz,
    datasets,
    y,
    (item) => `${item.dataset.label}: ${(item.raw as PlotPoint).y.toFixed(1)} dB`,
  );
}

export function loadStepConfig(kit: ChartKit, data: PanelData, colors: ChartColors): Config {
  const l = data.closedCircuit?.loadStep;
  if (!l) return kit.empty(colors);
  const datasets = [
    kit.line(
      'load-step',
      'output deviation (V per A of load step)',
      l.t.map((t, i) => ({ x: t, y: l.y[i]! })),
      colors.series[0]!,
    ),
  ];
  const x = {
    type: 'linear',
    ...kit.axis(colors, 'time (s)'),
    min: l.t[0],
    max: l.t[l.t.length - 1],
    ticks: {
      ...kit.axis(colors, '').ticks,
      maxTicksLimit: 7,
      callback: (v: string | number) => formatSi(Number(v), 's', 2),
    },
  };
  const y = {
    type: 'linear',
    ...kit.axis(colors, 'deviation (V/A)'),
    ticks: { ...kit.axis(colors, '').ticks, callback: (v: string | number) => formatSi(Number(v), 'V/A', 2) },
  };
  return lineChart(
    kit,
    colors,
    datasets,
    x,
    y,
    (t) => formatSi(t, 's'),
    (item) => `${formatSi((item.raw as PlotPoint).y, 'V/A')} per A`,
  );
}

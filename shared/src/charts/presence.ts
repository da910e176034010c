// Whether a chart has anything to draw for a design: the panel shows a note instead of empty axes, and a
// chart that is only for some designs (onlyWhenPresent) is left out entirely, in the panel and the report.
import type { PanelData, PanelSweep } from '../protocol/panelData';
import { chart as descriptor, type ChartId } from './descriptors';

/** The sweep a chart of sweeps shows: the one selected, else the first. */
export function selectedSweep(data: PanelData, index = 0): PanelSweep | undefined {
  return data.sweeps?.[index] ?? data.sweeps?.[0];
}

export function hasChartData(id: ChartId, data: PanelData): boolean {
  switch (id) {
    case 'locus':
      return data.locus.poles.length > 0;
    case 'bode':
      return data.bode.hz.length > 0;
    case 'step':
      return data.step.t.length > 0;
    case 'splane':
      return data.poles.length + data.zeros.length > 0;
    case 'sweep-margins':
      return (data.sweeps?.length ?? 0) > 0;
    case 'sweep-locus':
      return (data.sweeps ?? []).some((s) => s.locus.length > 0);
    case 'zout':
      return (data.closedCircuit?.hz.length ?? 0) > 0;
    case 'load-step':
      return (data.closedCircuit?.loadStep?.t.length ?? 0) > 0;
    case 'supply-rejection':
      return (data.closedCircuit?.supplies.length ?? 0) > 0;
  }
  const _: never = id;
  return _;
}

/** Left out entirely (not even a note) for this design. */
export function chartAbsent(id: ChartId, data: PanelData): boolean {
  const d = descriptor(id) as { onlyWhenPresent?: boolean };
  return d.onlyWhenPresent === true && !hasChartData(id, data);
}

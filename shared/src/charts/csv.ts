// Each chart's data as CSV, in SI units with the unit in the header: what a designer pastes into a sheet.
import type { PanelData } from '../protocol/panelData';
import { chart as descriptor, type ChartId } from './descriptors';
import { modulusHz } from '../numeric/complex';
import { selectedSweep } from './presence';

function quote(field: string): string {
  return /[",\n\r]/.test(field) ? `"${field.replace(/"/g, '""')}"` : field;
}

function rows(
  header: readonly string[],
  body: readonly (readonly (string | number | undefined)[])[],
): string {
  const line = (r: readonly (string | number | undefined)[]) =>
    r.map((v) => (v === undefined ? '' : quote(typeof v === 'number' ? String(v) : v))).join(',');
  return [line(header), ...body.map(line)].join('\n') + '\n';
}

/** `sweep`: which of the design's sweeps the sweep charts export (the one the panel shows). */
export function chartCsv(chart: ChartId, data: PanelData, sweep = 0): string {
  return rows(descriptor(chart).csvColumns, csvBody(chart, data, sweep));
}

/** One row per point, in the order of the chart's `csvColumns`. */
function csvBody(chart: ChartId, data: PanelData, sweep: number): (string | number | undefined)[][] {
  switch (chart) {
    case 'locus':
      return [...data.locus.poles, ...data.locus.zeros].flatMap((s) =>
        s.cc.map((cc, i) => [s.label, cc, s.hz[i]!]),
      );
    case 'bode':
      return data.bode.hz.map((hz, i) => [hz, data.bode.magDb[i], data.bode.phaseDeg[i]]);
    case 'step': {
      const ls = data.step.largeSignal;
      return [
        ...data.step.t.map((t, i) => [t, data.step.y[i], undefined]),
        // On its own time grid: a row per sample with the small-signal column empty.
        ...(ls ? ls.t.map((t, i) => [t, undefined, ls.y[i]]) : []),
      ];
    }
    case 'zout': {
      const c = data.closedCircuit;
      return c ? c.hz.map((f, i) => [f, c.zoutOhm[i]]) : [];
    }
    case 'load-step': {
      const l = data.closedCircuit?.loadStep;
      return l ? l.t.map((t, i) => [t, l.y[i]]) : [];
    }
    case 'supply-rejection': {
      const c = data.closedCircuit;
      return c ? c.supplies.flatMap((s) => c.hz.map((f, i) => [s.node, f, s.rejectionDb[i]])) : [];
    }
    case 'splane':
      return [
        ...data.poles.map((p) => [
          'pole',
          p.s.re,
          p.s.im,
          p.hz,
          p.damping,
          p.namedAfter,
          p.participation.map((q) => `${q.node}:${q.share.toFixed(4)}`).join(' '),
        ]),
        ...data.zeros.map((z) => [z.rhp ? 'zero (RHP)' : 'zero', z.s.re, z.s.im, z.hz, '', '', '']),
        ...(data.closedLoopPoles ?? []).map((s) => [
          'closed-loop pole',
          s.re,
          s.im,
          modulusHz(s),
          '',
          '',
          '',
        ]),
      ];
    case 'sweep-margins': {
      const sw = selectedSweep(data, sweep);
      if (!sw) return [];
      const num = (v: number | null | undefined) => (v === null ? undefined : v);
      return sw.corners.flatMap((c) =>
        sw.values.map((x, i) => [
          c.corner,
          x,
          num(c.phaseMarginDeg[i]),
          num(c.ugfHz[i]),
          num(c.gainMarginDb[i]),
        ]),
      );
    }
    case 'sweep-locus': {
      const sw = selectedSweep(data, sweep);
      if (!sw) return [];
      return sw.locus.flatMap((t, k) =>
        t.values.map((x, i) => [t.kind, k + 1, x, t.s[i]!.re, t.s[i]!.im, modulusHz(t.s[i]!)]),
      );
    }
  }
  const _: never = chart;
  return _;
}

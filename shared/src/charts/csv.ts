// Each chart's data as CSV, in SI units with the unit in the header: what a designer pastes into a sheet.
import type { PanelData } from '../protocol/panelData';
import type { ChartId } from '../protocol/webviewMessages';

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

export function chartCsv(chart: ChartId, data: PanelData): string {
  switch (chart) {
    case 'locus': {
      const body: (string | number)[][] = [];
      for (const s of [...data.locus.poles, ...data.locus.zeros]) {
        s.cc.forEach((cc, i) => body.push([s.label, cc, s.hz[i]!]));
      }
      return rows(['series', 'cc_F', 'magnitude_Hz'], body);
    }
    case 'bode':
      return rows(
        ['frequency_Hz', 'loop_gain_dB', 'loop_phase_deg'],
        data.bode.hz.map((hz, i) => [hz, data.bode.magDb[i], data.bode.phaseDeg[i]]),
      );
    case 'step':
      return rows(
        ['time_s', 'output'],
        data.step.t.map((t, i) => [t, data.step.y[i]]),
      );
    case 'splane':
      return rows(
        [
          'kind',
          'real_rad_per_s',
          'imag_rad_per_s',
          'magnitude_Hz',
          'damping',
          'named_after',
          'participation',
        ],
        [
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
            Math.hypot(s.re, s.im) / (2 * Math.PI),
            '',
            '',
            '',
          ]),
        ],
      );
  }
}

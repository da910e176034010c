// The charts, each defined once: the panel's cards, the messages that name a chart, the export file names,
// the CSV header and the report's figures are all read from this table. Adding a chart is one entry here;
// the compiler then points at what still has to draw it (draw.ts) and write its CSV (csv.ts).

export interface ChartDescriptor {
  /** Stable id: in messages between panel and host, element ids and the saved panel state. */
  readonly id: string;
  /** The one title, on every surface (panel card, report figure, README, help). */
  readonly title: string;
  /** What the chart shows, in a sentence: the report's caption and the panel card's tooltip. */
  readonly shows: string;
  /** Base of the exported file names (PNG and CSV), after the design's name. */
  readonly fileName: string;
  /** The CSV header: SI units in each column's name, so the numbers paste into a sheet as they are. */
  readonly csvColumns: readonly string[];
  /**
   * Shown only for a design that has what it draws (a sweep, say): absent elsewhere rather than an empty
   * card on every design. See presence.ts.
   */
  readonly onlyWhenPresent?: boolean;
  /** Shows one of the design's sweeps (the panel's selector picks which; the report draws one per sweep). */
  readonly perSweep?: boolean;
}

export const CHARTS = [
  {
    id: 'locus',
    title: 'Pole split',
    shows:
      'Pole and zero frequencies against the compensation capacitor, from Cc = 0 (left edge) past the written value.',
    fileName: 'pole-split',
    csvColumns: ['series', 'cc_F', 'magnitude_Hz'],
  },
  {
    id: 'bode',
    title: 'Loop gain',
    shows: 'Magnitude and phase of the loop gain, with every unity crossing and the phase margin.',
    fileName: 'loop-gain',
    csvColumns: ['frequency_Hz', 'loop_gain_dB', 'loop_phase_deg'],
  },
  {
    id: 'step',
    title: 'Step response',
    shows:
      'Closed-loop response to a unit input step, with the settling band; with a stated large-signal step, that response too (per volt of step), its slewing shaded.',
    fileName: 'step-response',
    csvColumns: ['time_s', 'output', 'large_signal_output_per_V'],
  },
  {
    id: 'splane',
    title: 'Poles and zeros',
    shows:
      'Open-loop poles and zeros and the closed-loop poles in the complex plane (rad/s, symmetric logarithmic axes).',
    fileName: 'poles-and-zeros',
    csvColumns: [
      'kind',
      'real_rad_per_s',
      'imag_rad_per_s',
      'magnitude_Hz',
      'damping',
      'named_after',
      'participation',
    ],
  },
  {
    id: 'sweep-margins',
    title: 'Margins over the sweep',
    shows:
      'Phase margin, UGF and gain margin against the swept parameter, one line per corner, with the requirements and the stretches where one fails shaded.',
    fileName: 'sweep-margins',
    csvColumns: ['corner', 'swept_value_SI', 'phase_margin_deg', 'ugf_Hz', 'gain_margin_dB'],
    onlyWhenPresent: true,
    perSweep: true,
  },
  {
    id: 'sweep-locus',
    title: 'Root locus over the sweep',
    shows:
      'Open-loop poles and zeros of the nominal corner as the swept parameter moves from its low end (○) to its high end (×), in the complex plane (rad/s, symmetric logarithmic axes).',
    fileName: 'sweep-locus',
    csvColumns: ['kind', 'track', 'swept_value_SI', 'real_rad_per_s', 'imag_rad_per_s', 'magnitude_Hz'],
    onlyWhenPresent: true,
    perSweep: true,
  },
  {
    id: 'zout',
    title: 'Output impedance',
    shows:
      'Magnitude of the closed circuit’s output impedance against frequency (a loop closed by its own elements).',
    fileName: 'output-impedance',
    csvColumns: ['frequency_Hz', 'zout_ohm'],
    onlyWhenPresent: true,
  },
  {
    id: 'load-step',
    title: 'Load step',
    shows: 'The output’s deviation for a step of load current drawn from it, per ampere of step.',
    fileName: 'load-step',
    csvColumns: ['time_s', 'deviation_V_per_A'],
    onlyWhenPresent: true,
  },
  {
    id: 'supply-rejection',
    title: 'Supply rejection',
    shows: 'Rejection of each supply at the output against frequency: −20·log10 |v(out)/v(supply)|.',
    fileName: 'supply-rejection',
    csvColumns: ['supply', 'frequency_Hz', 'rejection_dB'],
    onlyWhenPresent: true,
  },
] as const satisfies readonly ChartDescriptor[];

export type ChartId = (typeof CHARTS)[number]['id'];

/** The charts' ids in the order every surface shows them. */
export const CHART_IDS: readonly ChartId[] = CHARTS.map((c) => c.id);

const BY_ID = new Map<string, ChartDescriptor>(CHARTS.map((c) => [c.id, c]));

export function chart(id: ChartId): ChartDescriptor {
  return BY_ID.get(id)!;
}

/** For messages that crossed from the webview: only an id in the table is a chart. */
export function isChartId(v: unknown): v is ChartId {
  return typeof v === 'string' && BY_ID.has(v);
}

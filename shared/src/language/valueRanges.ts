// The one table of what each kind of value usually is. The language's plausibility check reads it, the
// docs list it (a test keeps them equal), and nothing else keeps ranges of its own. The usual ranges are
// common practice for integrated amplifiers, kept wide enough for board-level loads.

export type ValueRole =
  | 'gm-stage'
  | 'gm'
  | 'gm-buffer'
  | 'rout'
  | 'rz'
  | 'res'
  | 'cap'
  | 'cap-board'
  | 'bias'
  | 'beta'
  | 'ugf'
  | 'pm'
  | 'gainmargin'
  | 'dcgain'
  | 'zero'
  | 'slew'
  | 'tolerance'
  | 'within'
  | 'step'
  | 'zout'
  | 'psrr'
  | 'clgain'
  | 'deviation'
  | 'load-step'
  | 'at-frequency';

export interface ValueRange {
  /** The SI unit the range is in (`''` for a plain number). */
  readonly unit: string;
  /** Below `low` or above `high` (absolute SI) draws a warning. */
  readonly low: number;
  readonly high: number;
  /** A typical value, to pick the prefix a suggestion uses. */
  readonly typical: number;
  /** `a transconductance`: for "outside the usual range for …". */
  readonly what: string;
  /** `transconductance`: for "not a plausible …". */
  readonly noun: string;
  /** Where the language uses this range, as the docs list it. */
  readonly fields: string;
}

export const VALUE_RANGES: Readonly<Record<ValueRole, ValueRange>> = {
  'gm-stage': {
    unit: 'S',
    low: 1e-9,
    high: 1,
    typical: 1e-4,
    what: 'a transconductance',
    noun: 'transconductance',
    fields: '`gm` of a stage',
  },
  gm: {
    unit: 'S',
    low: 1e-9,
    high: 1,
    typical: 1e-4,
    what: 'a transconductance',
    noun: 'transconductance',
    fields: '`gm` of `feedforward`, `element gm`',
  },
  'gm-buffer': {
    unit: 'S',
    low: 1e-9,
    high: 1,
    typical: 1e-4,
    what: 'a transconductance',
    noun: 'transconductance',
    fields: '`gm` of `indirect`',
  },
  rout: {
    unit: 'ohm',
    low: 10,
    high: 1e12,
    typical: 1e5,
    what: 'a stage output resistance',
    noun: 'output resistance',
    fields: '`rout`',
  },
  rz: {
    unit: 'ohm',
    low: 1,
    high: 1e8,
    typical: 1e3,
    what: 'a nulling resistor',
    noun: 'nulling resistance',
    fields: '`rz`',
  },
  res: {
    unit: 'ohm',
    low: 1e-3,
    high: 1e13,
    typical: 1e4,
    what: 'a resistance',
    noun: 'resistance',
    fields: '`res` of `load`, `element res`',
  },
  cap: {
    unit: 'F',
    low: 1e-18,
    high: 1e-6,
    typical: 1e-12,
    what: 'an on-chip capacitance',
    noun: 'capacitance',
    fields: '`cap` of a stage and of `indirect`, `cc`',
  },
  'cap-board': {
    unit: 'F',
    low: 1e-18,
    high: 1e-2,
    typical: 1e-12,
    what: 'a capacitance',
    noun: 'capacitance',
    fields: '`cap` of `load`, `element cap`',
  },
  bias: {
    unit: 'A',
    low: 1e-12,
    high: 10,
    typical: 1e-5,
    what: 'a bias current',
    noun: 'bias current',
    fields: '`bias`',
  },
  beta: {
    unit: '',
    low: 1e-9,
    high: 1,
    typical: 1,
    what: 'a feedback factor',
    noun: 'feedback factor',
    fields: '`beta`',
  },
  ugf: {
    unit: 'Hz',
    low: 1,
    high: 1e12,
    typical: 1e7,
    what: 'a unity-gain frequency',
    noun: 'unity-gain frequency',
    fields: '`require ugf`',
  },
  pm: {
    unit: 'deg',
    low: 0,
    high: 180,
    typical: 60,
    what: 'a phase margin',
    noun: 'phase margin',
    fields: '`require pm`',
  },
  gainmargin: {
    unit: 'dB',
    low: 0,
    high: 100,
    typical: 10,
    what: 'a gain margin',
    noun: 'gain margin',
    fields: '`require gainmargin`',
  },
  dcgain: {
    unit: 'dB',
    low: -40,
    high: 250,
    typical: 80,
    what: 'a DC gain',
    noun: 'DC gain',
    fields: '`require dcgain`',
  },
  zero: {
    unit: '',
    low: 0,
    high: 1e4,
    typical: 10,
    what: 'a zero-to-UGF ratio',
    noun: 'zero-to-UGF ratio',
    fields: '`require zero` (the multiple of `ugf`)',
  },
  slew: {
    unit: 'V/s',
    low: 1e3,
    high: 1e13,
    typical: 1e6,
    what: 'a slew rate',
    noun: 'slew rate',
    fields: '`require slew`',
  },
  tolerance: {
    unit: '',
    low: 1e-9,
    high: 0.5,
    typical: 1e-3,
    what: 'a settling tolerance',
    noun: 'settling tolerance',
    fields: '`require settle` tolerance',
  },
  within: {
    unit: 's',
    low: 1e-13,
    high: 1e3,
    typical: 1e-6,
    what: 'a settling time',
    noun: 'settling time',
    fields: '`require settle … within`',
  },
  step: {
    unit: 'V',
    low: 1e-6,
    high: 100,
    typical: 1,
    what: 'a step amplitude',
    noun: 'step amplitude',
    fields: '`require settle … step`',
  },
  zout: {
    unit: 'ohm',
    low: 1e-4,
    high: 1e6,
    typical: 0.1,
    what: 'an output impedance',
    noun: 'output impedance',
    fields: '`require zout`',
  },
  psrr: {
    unit: 'dB',
    low: 0,
    high: 160,
    typical: 60,
    what: 'a supply rejection',
    noun: 'supply rejection',
    fields: '`require psrr`',
  },
  clgain: {
    unit: 'dB',
    low: -60,
    high: 80,
    typical: 6,
    what: 'a closed-loop gain',
    noun: 'closed-loop gain',
    fields: '`require clgain`',
  },
  deviation: {
    unit: 'V',
    low: 1e-6,
    high: 10,
    typical: 0.03,
    what: 'an output deviation',
    noun: 'output deviation',
    fields: '`require loadstep` deviation',
  },
  'load-step': {
    unit: 'A',
    low: 1e-9,
    high: 100,
    typical: 0.01,
    what: 'a load-current step',
    noun: 'load-current step',
    fields: '`require loadstep … for`',
  },
  'at-frequency': {
    unit: 'Hz',
    low: 1e-3,
    high: 1e12,
    typical: 1e3,
    what: 'a frequency',
    noun: 'frequency',
    fields: '`require zout … at`, `require psrr … at`',
  },
};

/**
 * Magnitudes (in SI, or deg and dB) that any value of a design may have; outside this band it is an error,
 * not a warning. At least twelve decades beyond every usual range above, so no real design meets it, and
 * far enough inside double precision (1e±308) that the engine's products and squares of such values still
 * stay finite and normal.
 */
export const ANALYSABLE_MAGNITUDE = { low: 1e-30, high: 1e30 } as const;

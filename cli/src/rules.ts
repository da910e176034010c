// One line of help per finding code, for SARIF rule metadata and `--format json` readers.
import type { CheckCode } from '../../shared/src/checks/types';

export interface RuleInfo {
  /** PascalCase name, as SARIF's `reportingDescriptor.name` wants an identifier-like word. */
  readonly name: string;
  readonly short: string;
  readonly help: string;
}

export const RULES: Readonly<Record<CheckCode, RuleInfo>> = {
  stability: {
    name: 'ClosedLoopStability',
    short: 'Closed loop unstable, or stable only conditionally',
    help: 'Judged from the closed-loop poles themselves, whatever the margins read: a closed-loop pole in the right half-plane is an error, one on the imaginary axis a sustained oscillation. When the open loop has right-half-plane poles of its own (a local loop with positive feedback, often a polarity slip), margins read from a Bode plot do not decide stability.',
  },
  'phase-margin': {
    name: 'PhaseMargin',
    short: 'Phase margin below the requirement',
    help: "The phase margin, read from the exact loop gain at every unity crossing (the smallest, in (−180°, 180°]), is below the design's `require pm` (or the phaseMargin setting). Fixes solve a compensation capacitor on the phase margin itself.",
  },
  'gain-margin': {
    name: 'GainMargin',
    short: 'Gain margin too small, or several unity crossings',
    help: 'The loop gain is within the gainMargin setting of 0 dB where its phase reaches −180°, or it crosses 0 dB more than once, so a healthy-looking first crossing can hide an unstable loop.',
  },
  'rhp-zero': {
    name: 'RightHalfPlaneZero',
    short: 'Right-half-plane zero too close to the unity-gain frequency',
    help: 'A right-half-plane zero lies below rhpZeroFactor times the unity-gain frequency; it adds phase lag like a pole while lifting the gain like a zero, which flattens the roll-off and pushes the crossover out. With a Miller capacitor it sits near gm/Cc of the stage it wraps; a series nulling resistor moves it to 1/(Cc(1/gm2 − Rz)).',
  },
  'gm-ratio': {
    name: 'SecondStageTransconductance',
    short: 'Second-stage gm too small for an uncontrolled zero',
    help: 'Without zero control the zero over the gain-bandwidth equals gm2/gm1, so gm2 below gmRatio·gm1 brings the zero close to the crossover.',
  },
  'nondominant-pole': {
    name: 'NonDominantPole',
    short: 'First non-dominant pole too close to the unity-gain frequency',
    help: 'The first non-dominant pole lies below nondominantFactor times the unity-gain frequency, which costs phase margin. Raising the compensation capacitor relative to the load, or the second-stage gm, moves it up.',
  },
  'second-stage-bandwidth': {
    name: 'SecondStageBandwidth',
    short: 'Required unity-gain frequency beyond what the second stage supports',
    help: 'Miller compensation works only while the second stage still has gain; the required unity-gain frequency is above that range.',
  },
  'complex-poles': {
    name: 'ComplexPoles',
    short: 'Lightly damped non-dominant poles or closed-loop peaking',
    help: 'A non-dominant pole pair has a damping ratio below complexDamping, or the closed-loop response peaks more than peakingDb above its DC value: expect ringing and slow settling.',
  },
  doublet: {
    name: 'PoleZeroDoublet',
    short: 'Pole-zero doublet below the unity-gain frequency',
    help: "A left-half-plane zero lies within doubletSpread of a pole below the unity-gain frequency; the pair leaves a slow settling tail with the doublet's time constant.",
  },
  'slew-rate': {
    name: 'SlewRate',
    short: 'Slew rate below the requirement',
    help: "The slew rate, the smallest bias current over the capacitance it must charge, is below the design's `require slew`.",
  },
  settling: {
    name: 'Settling',
    short: 'Step response settles too slowly',
    help: 'The exact closed-loop step response does not stay within the stated tolerance by the required time.',
  },
  approximation: {
    name: 'ApproximationValidity',
    short: 'Hand formula far from the exact pole or zero',
    help: 'The classic hand formula for a pole or zero differs from the exact root by more than approximationError; a conclusion drawn from the formula would mislead here.',
  },
  plausibility: {
    name: 'Plausibility',
    short: 'Value far outside its usual range',
    help: 'A value is many decades away from the usual range of its kind, or is zero or negative; a missing SI prefix is the usual cause.',
  },
  ugf: {
    name: 'UnityGainFrequency',
    short: 'Unity-gain frequency misses the requirement',
    help: "The loop's unity-gain frequency (read at its lowest downward 0 dB crossing for a minimum, its highest for a maximum) does not meet the design's `require ugf`, or the loop gain never reaches 0 dB. The input transconductance and the compensation capacitor set the gain-bandwidth.",
  },
  'dc-gain': {
    name: 'DcGain',
    short: 'Open-loop DC gain misses the requirement',
    help: "The open-loop DC gain, the product of the stages' gm·rout, does not meet the design's `require` on DC gain.",
  },
  'closed-loop-gain': {
    name: 'ClosedLoopGain',
    short: 'Closed-loop DC gain misses the requirement',
    help: "The closed loop's DC gain from the input to the output does not meet `require clgain`. For a loop written as a circuit it is the whole circuit's gain, set mostly by the feedback network; for `feedback beta` it is |A(0)|/(1 + β·|A(0)|).",
  },
  'output-impedance': {
    name: 'OutputImpedance',
    short: 'Closed-loop output impedance above the requirement',
    help: "The closed circuit's output impedance (a test current into the output, every source held) exceeds `require zout`, at the stated frequency or at its peak over frequency. Needs `feedback at NODE`.",
  },
  'supply-rejection': {
    name: 'SupplyRejection',
    short: 'Supply rejection below the requirement',
    help: 'The rejection −20·log10|v(out)/v(supply)| of a `supply` node at the stated frequency is below `require psrr`. Needs `feedback at NODE` and a `supply`.',
  },
  'load-step': {
    name: 'LoadStep',
    short: 'Output deviation for a load step above the requirement',
    help: "The output's largest deviation for a load-current step of the stated size (the exact small-signal step response of the closed circuit's output impedance) exceeds `require loadstep`. Needs `feedback at NODE`.",
  },
  sweep: {
    name: 'Sweep',
    short: 'A requirement fails somewhere in a swept range, or the closed loop is unstable there',
    help: 'A `sweep` varies a parameter over a range and every requirement must hold at every value in it. The finding names the worst value of the swept parameter, its corner, and the sub-ranges where the requirement fails; the lowest margins between the sampled values are searched for, so a narrow dip is not missed. Small-signal only: the sweep is a family of linear models, not a large-signal simulation.',
  },
  syntax: {
    name: 'Syntax',
    short: 'The text does not follow the design-file language',
    help: 'The statement could not be read; the rest of the file is still checked.',
  },
  unit: {
    name: 'Unit',
    short: 'Unit or dimension mismatch',
    help: 'A value carries a unit of the wrong kind for its place (a resistance given in farads), or an expression mixes dimensions.',
  },
  reference: {
    name: 'Reference',
    short: 'Unknown or duplicate name',
    help: 'A name refers to no declared parameter, stage, node or corner, or is declared twice.',
  },
};

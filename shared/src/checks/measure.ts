// A requirement's measured value in one run, for hovers, inline hints and summaries.
import type { DesignAnalysis } from '../analysis/types';
import { formatDcGain, formatRatio, formatSlewRate, formatTolerance } from '../format/quantities';
import { formatDb, formatDeg, formatHz, formatSi } from '../format/si';
import type { Requirement } from '../language/model';
import { violates } from './locate';
import { largeSignalOf, requiredSettlingTime, settlingUnavailable } from './settling';
import { largeSignalSummary } from '../format/largeSignal';
import { gainDb } from '../units';
import {
  closedLoopDcGain,
  loadStepDeviation,
  outputImpedance,
  supplyRejection,
} from '../analysis/closedLoopValues';

export interface Measurement {
  /** What the requirement is about, for people (`phase margin`). */
  readonly label: string;
  /** The measured value as text (`62.1°`), or why there is none. */
  readonly measured: string;
  readonly required: string;
  readonly pass: boolean;
  /** Signed distance from the limit as text (`+2.1°`), when both values are numbers. */
  readonly margin?: string;
  /** The measured number in the requirement's unit, when there is one (for picking the worst corner). */
  readonly value?: number;
  /** A sentence on what sets the value, for the hover (the large-signal step: slewing or linear tail). */
  readonly detail?: string;
}

/**
 * Whether judging the requirement needs a time response (the closed-loop step, the load step): the
 * costliest part of an analysis, which the editor, the solve and the sweeps compute only where it is read.
 */
export function readsTimeResponse(req: Requirement): boolean {
  switch (req.kind) {
    case 'settle':
    case 'load-step':
      return true;
    case 'ugf':
    case 'pm':
    case 'gain-margin':
    case 'zero':
    case 'slew':
    case 'dc-gain':
    case 'closed-loop-gain':
    case 'output-impedance':
    case 'supply-rejection':
      return false;
    default: {
      const never: never = req;
      return never;
    }
  }
}

const signed = (x: number, text: string) => `${x >= 0 ? '+' : '−'}${text}`;
const OP = { '>=': '≥', '<=': '≤' } as const;

/**
 * A requirement's verdict and measured number (in its own unit) in one run, without any text: what the
 * findings, the hovers and the solve all judge by (`measure` adds the words).
 */
export function judge(
  req: Requirement,
  a: DesignAnalysis,
): { readonly value?: number; readonly pass: boolean } {
  const bound = (v: number | undefined, op: '>=' | '<=', limit: number) =>
    v === undefined ? { pass: false } : { value: v, pass: !violates(op, v, limit) };
  switch (req.kind) {
    case 'ugf':
      return bound(req.op === '>=' ? (a.loop.lowestUgfHz ?? a.loop.ugfHz) : a.loop.ugfHz, req.op, req.value);
    case 'pm':
      return bound(a.loop.phaseMarginDeg, req.op, req.value);
    case 'gain-margin': {
      const v = a.loop.gainMarginDb;
      return v === undefined ? { pass: req.op === '>=' } : bound(v, req.op, req.value);
    }
    case 'zero': {
      const ugf = a.loop.ugfHz;
      let lowest: number | undefined;
      for (const z of a.zeros)
        if (z.rhp && Number.isFinite(z.hz) && (lowest === undefined || z.hz < lowest)) lowest = z.hz;
      const ratio = lowest !== undefined && ugf ? lowest / ugf : undefined;
      return {
        ...(ratio !== undefined ? { value: ratio } : {}),
        pass: lowest === undefined || (ratio !== undefined && ratio >= req.factor),
      };
    }
    case 'slew':
      return bound(a.slew?.rate, req.op, req.value);
    case 'settle': {
      const v = requiredSettlingTime(req, a);
      return v === undefined ? { pass: false } : { value: v, pass: v <= req.within };
    }
    case 'dc-gain': {
      const v = gainDb(a.dcGain);
      return { value: v, pass: !Number.isNaN(v) && !violates(req.op, v, req.value) };
    }
    case 'closed-loop-gain': {
      const g = closedLoopDcGain(a);
      return g === undefined ? { pass: false } : bound(gainDb(g), req.op, req.value);
    }
    case 'output-impedance':
      return bound(outputImpedance(a, req.atHz), req.op, req.value);
    case 'supply-rejection':
      return bound(supplyRejection(a, req.atHz, req.supply)?.db, req.op, req.value);
    case 'load-step':
      return bound(loadStepDeviation(a, req.step), req.op, req.value);
  }
}

/** Why a closed-circuit requirement has no value in this analysis, in words. */
function notMeasured(a: DesignAnalysis, what: string): string {
  if (a.problems.length > 0) return 'not computed';
  if (!a.closedCircuit)
    return `needs the loop written as a circuit (\`feedback at NODE\`) to compute the ${what}`;
  return 'no supply is declared (`supply NODE`)';
}

export function measure(req: Requirement, a: DesignAnalysis): Measurement {
  const j = judge(req, a);
  switch (req.kind) {
    case 'ugf': {
      // With several downward crossings the conservative reading is the lowest one for a minimum and the
      // highest for a maximum, and the text names it.
      const v = req.op === '>=' ? (a.loop.lowestUgfHz ?? a.loop.ugfHz) : a.loop.ugfHz;
      const several = a.loop.lowestUgfHz !== undefined && a.loop.lowestUgfHz !== a.loop.ugfHz;
      const which = req.op === '>=' ? 'lowest' : 'highest';
      return {
        label: 'unity-gain frequency',
        measured:
          v === undefined
            ? 'loop gain never reaches 0 dB'
            : several
              ? `${formatHz(v)} (the ${which} of several downward 0 dB crossings)`
              : formatHz(v),
        required: `${OP[req.op]} ${formatHz(req.value)}`,
        pass: j.pass,
        ...(v !== undefined
          ? { value: v, margin: signed(v - req.value, formatHz(Math.abs(v - req.value))) }
          : {}),
      };
    }
    case 'pm': {
      const v = a.loop.phaseMarginDeg;
      return {
        label: 'phase margin',
        measured: v === undefined ? 'no unity crossing' : formatDeg(v),
        required: `${OP[req.op]} ${formatDeg(req.value)}`,
        pass: j.pass,
        ...(v !== undefined
          ? { value: v, margin: signed(v - req.value, formatDeg(Math.abs(v - req.value))) }
          : {}),
      };
    }
    case 'gain-margin': {
      const v = a.loop.gainMarginDb;
      return {
        label: 'gain margin',
        measured: v === undefined ? 'phase never reaches −180° (unbounded)' : formatDb(v),
        required: `${OP[req.op]} ${formatDb(req.value)}`,
        pass: j.pass,
        ...(v !== undefined
          ? { value: v, margin: signed(v - req.value, formatDb(Math.abs(v - req.value))) }
          : {}),
      };
    }
    case 'zero': {
      const ugf = a.loop.ugfHz;
      const rhp = a.zeros.filter((z) => z.rhp && Number.isFinite(z.hz)).sort((x, y) => x.hz - y.hz)[0];
      const ratio = rhp && ugf ? rhp.hz / ugf : undefined;
      return {
        label: 'lowest right-half-plane zero',
        measured: !rhp
          ? 'no RHP zero'
          : ratio === undefined
            ? formatHz(rhp.hz)
            : `${formatHz(rhp.hz)} = ${formatRatio(ratio)} UGF`,
        required: `≥ ${req.factor} × UGF`,
        pass: j.pass,
        ...(ratio !== undefined ? { value: ratio } : {}),
      };
    }
    case 'slew': {
      const v = a.slew?.rate;
      return {
        label: 'slew rate',
        measured: v === undefined ? 'no stage states its bias' : formatSlewRate(v),
        required: `${OP[req.op]} ${formatSlewRate(req.value)}`,
        pass: j.pass,
        ...(v !== undefined
          ? { value: v, margin: signed(v - req.value, formatSlewRate(Math.abs(v - req.value))) }
          : {}),
      };
    }
    case 'settle': {
      const v = requiredSettlingTime(req, a);
      const pct = formatTolerance(req.tolerance);
      const unavailable = settlingUnavailable(req, a);
      const large = largeSignalOf(req, a);
      return {
        label:
          req.step !== undefined
            ? `settling of a ${formatSi(req.step, 'V')} step to ±${pct}`
            : `settling to ±${pct}`,
        measured:
          unavailable !== undefined
            ? `not computed: ${unavailable}`
            : v === undefined
              ? 'does not settle in the computed span'
              : formatSi(v, 's') +
                (large?.saturatedStage !== undefined
                  ? ' (beyond the output range)'
                  : large && large.slewingTime > 0
                    ? ` (slewing ${formatSi(large.slewingTime, 's')})`
                    : ''),
        required: `≤ ${formatSi(req.within, 's')}`,
        pass: j.pass,
        ...(large ? { detail: largeSignalSummary(large, a.slew) } : {}),
        ...(v !== undefined
          ? { value: v, margin: signed(req.within - v, formatSi(Math.abs(req.within - v), 's')) }
          : {}),
      };
    }
    case 'closed-loop-gain': {
      const g = closedLoopDcGain(a);
      const v = g === undefined ? undefined : gainDb(g);
      return {
        label: 'closed-loop DC gain',
        measured: g === undefined ? 'not computed' : formatDcGain(g),
        required: `${OP[req.op]} ${formatDb(req.value)}`,
        pass: j.pass,
        ...(v !== undefined ? { value: v } : {}),
        ...(v !== undefined && Number.isFinite(v)
          ? { margin: signed(v - req.value, formatDb(Math.abs(v - req.value))) }
          : {}),
      };
    }
    case 'output-impedance': {
      const v = j.value;
      const where = req.atHz === undefined ? 'peak' : `at ${formatHz(req.atHz)}`;
      return {
        label: `output impedance (${where})`,
        measured:
          v === undefined
            ? notMeasured(a, 'output impedance')
            : req.atHz === undefined && a.closedCircuit
              ? `${formatSi(v, 'ohm')} at ${formatHz(a.closedCircuit.outputImpedance.peakHz)}`
              : formatSi(v, 'ohm'),
        required: `≤ ${formatSi(req.value, 'ohm')}`,
        pass: j.pass,
        ...(v !== undefined
          ? { value: v, margin: signed(req.value - v, formatSi(Math.abs(req.value - v), 'ohm')) }
          : {}),
      };
    }
    case 'supply-rejection': {
      const r = supplyRejection(a, req.atHz, req.supply);
      const of =
        req.supply ??
        (a.closedCircuit?.supplies.length === 1 ? a.closedCircuit.supplies[0]!.node : 'every supply');
      return {
        label: `supply rejection from ${of} at ${formatHz(req.atHz)}`,
        measured:
          r === undefined
            ? notMeasured(a, 'supply rejection')
            : `${formatDb(r.db)}${req.supply === undefined && (a.closedCircuit?.supplies.length ?? 0) > 1 ? ` (from ${r.node})` : ''}`,
        required: `≥ ${formatDb(req.value)}`,
        pass: j.pass,
        ...(r !== undefined
          ? { value: r.db, margin: signed(r.db - req.value, formatDb(Math.abs(r.db - req.value))) }
          : {}),
      };
    }
    case 'load-step': {
      const v = j.value;
      return {
        label: `output deviation for a ${formatSi(req.step, 'A')} load step`,
        measured: v === undefined ? notMeasured(a, 'load step') : formatSi(v, 'V'),
        required: `≤ ${formatSi(req.value, 'V')}`,
        pass: j.pass,
        ...(v !== undefined
          ? { value: v, margin: signed(req.value - v, formatSi(Math.abs(req.value - v), 'V')) }
          : {}),
      };
    }
    case 'dc-gain': {
      const v = gainDb(a.dcGain);
      return {
        label: a.closedCircuit ? 'loop gain at DC' : 'open-loop DC gain',
        measured: formatDcGain(a.dcGain),
        required: `${OP[req.op]} ${formatDb(req.value)}`,
        pass: j.pass,
        value: v,
        ...(Number.isFinite(v) ? { margin: signed(v - req.value, formatDb(Math.abs(v - req.value))) } : {}),
      };
    }
  }
}

// The panel's view of two results that only some designs have: the large-signal step (a `settle`
// requirement with a `step`) and a loop closed by its own elements (`feedback at`). Read from the analysis
// as it is; the only computation here is evaluating the closed circuit's transfers on a frequency grid.
import type { DesignAnalysis, Transfer } from '../analysis/types';
import { magnitudeSquared } from '../analysis/frequency';
import type { PanelClosedCircuit, PanelLargeSignalStep } from '../protocol/panelData';
import { logSpace } from './buildPanelData';

/** Points per decade of the closed circuit's frequency charts. */
const PER_DECADE = 30;

export function panelLargeSignal(a: DesignAnalysis): PanelLargeSignalStep | undefined {
  const l = a.largeSignalStep;
  if (!l || !(l.amplitude !== 0)) return undefined;
  // Per volt of input step, as the small-signal unit step is drawn.
  const per = (v: number) => v / l.amplitude;
  return {
    amplitude: l.amplitude,
    t: l.samples.t,
    y: l.samples.y.map(per),
    final: per(l.final),
    ...(l.settlingTime !== undefined ? { settlingTime: l.settlingTime } : {}),
    ...(l.smallSignalSettlingTime !== undefined
      ? { smallSignalSettlingTime: l.smallSignalSettlingTime }
      : {}),
    slewing: l.slewing.map((s) => ({ start: s.start, end: s.end })),
    slewRateReached: l.slewRateReached,
    ...(l.limitingStage !== undefined ? { limitingStage: l.limitingStage } : {}),
  };
}

/** |H(j2πf)| of a pole/zero/gain transfer: k·Π(s − z)/Π(s − p). */
const magnitude = (h: Transfer, hz: number) => Math.sqrt(magnitudeSquared(h, 2 * Math.PI * hz));

export function panelClosedCircuit(a: DesignAnalysis): PanelClosedCircuit | undefined {
  const c = a.closedCircuit;
  if (!c) return undefined;
  const hz = logSpace(c.band.loHz, c.band.hiHz, PER_DECADE);
  return {
    hz,
    zoutOhm: hz.map((f) => magnitude(c.outputImpedance, f)),
    ...(c.loadStep ? { loadStep: { t: c.loadStep.t, y: c.loadStep.y, final: c.loadStep.final } } : {}),
    supplies: c.supplies.map((s) => ({
      node: s.node,
      rejectionDb: hz.map((f) => -20 * Math.log10(magnitude(s.transfer, f))),
    })),
  };
}

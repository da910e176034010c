// A loop written as a circuit, in words: the real loop at its feedback node and each supply's rejection.
// One home for the wording the hover, the inline values and the panel show.
import type { DesignAnalysis } from '../analysis/types';
import { formatDcGain } from './quantities';
import { formatDb, formatDeg, formatHz, formatSi } from './si';
import { closedLoopDcGain } from '../analysis/closedLoopValues';

/** `loop gain 47.9 dB at DC · UGF 133 kHz · PM 59.1°` for the loop broken at its feedback node. */
export function feedbackLoopText(a: DesignAnalysis): string {
  if (a.problems.length > 0) return 'not analyzed';
  const l = a.loop;
  const parts = [
    `loop gain ${formatDcGain(a.dcGain)} at DC`,
    `UGF ${l.ugfHz !== undefined ? formatHz(l.ugfHz) : 'none (never 0 dB)'}`,
    `PM ${l.phaseMarginDeg !== undefined ? formatDeg(l.phaseMarginDeg) : '—'}`,
  ];
  return parts.join(' · ');
}

/** The closed circuit's own numbers, one per line, for the hover of `feedback at`. */
export function closedCircuitLines(a: DesignAnalysis): string[] {
  const c = a.closedCircuit;
  if (!c) return [];
  const g = closedLoopDcGain(a);
  const lines = [
    `Closed loop: DC gain ${g === undefined ? '—' : formatDcGain(g)}, bandwidth ${a.closedLoopBandwidthHz !== undefined ? formatHz(a.closedLoopBandwidthHz) : '—'}`,
    `Output impedance: ${formatSi(Math.abs(c.outputImpedance.dcOhm), 'ohm')} at DC, peak ${formatSi(c.outputImpedance.peakOhm, 'ohm')} at ${formatHz(c.outputImpedance.peakHz)}`,
  ];
  if (c.loadStep)
    lines.push(
      `Load step: ${formatSi(c.loadStep.peakDeviation / 1000, 'V')} per mA at its peak` +
        (c.loadStep.settlingTime !== undefined
          ? `, back within ${c.loadStep.tolerance * 100} % of the peak after ${formatSi(c.loadStep.settlingTime, 's')}`
          : ''),
    );
  for (const s of c.supplies) lines.push(`Supply ${s.node}: ${supplyText(a, s.node)}`);
  return lines;
}

/** `rejection 25.4 dB at DC · worst 24.9 dB at 78.1 kHz`, or undefined when `node` is not a supply. */
export function supplyText(a: DesignAnalysis, node: string): string | undefined {
  const s = a.closedCircuit?.supplies.find((x) => x.node === node);
  if (!s) return undefined;
  return `rejection ${formatDb(s.dcDb)} at DC · worst ${formatDb(s.worstDb)} at ${formatHz(s.worstHz)}`;
}

// A LHP zero close to a pole below the UGF: the doublet leaves a slow settling tail with roughly the
// zero's time constant (GHLM, settling of doublets).
import { formatPercent } from '../format/quantities';
import { formatHz, formatSi } from '../format/si';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { fieldRange, primaryCompensation, judgedAsLoop } from './locate';

/** Below this relative spread a pole and zero cancel to numerical precision: no tail is left. */
const EXACT = 1e-6;

/**
 * |z − p| / p. A pole at the origin has no relative neighbourhood: a zero there too cancels it exactly (0),
 * any other zero is infinitely far in ratio.
 */
export function doubletSpread(zeroHz: number, poleHz: number): number {
  if (poleHz > 0) return Math.abs(zeroHz - poleHz) / poleHz;
  return zeroHz === poleHz ? 0 : Infinity;
}

export const doubletCheck: Check = (input: CheckInput) =>
  acrossRuns(input, 'doublet', (run): Hit[] => {
    if (!judgedAsLoop(run.model)) return [];
    const ugf = run.analysis.loop.ugfHz;
    if (ugf === undefined) return [];
    let best: { zeroHz: number; poleHz: number; spread: number } | undefined;
    for (const z of run.analysis.zeros) {
      // A zero at the origin has no time constant to leave as a tail.
      if (z.rhp || !Number.isFinite(z.hz) || !(z.hz > 0)) continue;
      for (const p of run.analysis.poles) {
        if (!(p.hz < ugf)) continue;
        const spread = doubletSpread(z.hz, p.hz);
        if (!(spread > EXACT) || !(spread <= input.settings.doubletSpread)) continue;
        if (!best || p.hz < best.poleHz) best = { zeroHz: z.hz, poleHz: p.hz, spread };
      }
    }
    if (!best) return [];
    const comp = primaryCompensation(run.model);
    const range =
      comp?.kind === 'miller' && comp.item.rz !== undefined
        ? fieldRange(comp.item.origin, 'rz')
        : comp
          ? fieldRange(comp.item.origin, 'cc')
          : input.source.nameRange;
    const tau = 1 / (2 * Math.PI * best.zeroHz);
    return [
      {
        key: 'doublet',
        severity: 'warning',
        message:
          `Left-half-plane zero at ${formatHz(best.zeroHz)} lies within ${formatPercent(best.spread)} of the pole at ` +
          `${formatHz(best.poleHz)}, below the UGF: this doublet leaves a slow settling tail (time constant about ${formatSi(tau, 's')})`,
        range,
        related: [],
        badness: tau,
      },
    ];
  });

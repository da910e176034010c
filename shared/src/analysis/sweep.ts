// The pole-split locus: poles and zeros against one compensation value. For a capacitor the network is
// affine in the value (C = C₀ + v·ΔC), so it is built twice and interpolated instead of rebuilt per point.
import type { DesignModel } from '../language/model';
import type { Network } from '../circuit/network';
import type { CancelToken, Complex, LocusPoint } from './types';
import { buildLoopNetwork } from './loopCore';
import { cancelAtOrigin, heldCharges } from './heldCharge';
import { realize } from './realization';
import { poleZeroGain } from './polesZeros';
import { byMagnitude } from './core';
import { withValue, type CompensationTarget } from './variants';

function rootsOf(net: Network): { poles: Complex[]; zeros: Complex[] } {
  try {
    const r = realize(net);
    if (!r.ok) return { poles: [], zeros: [] };
    const pz = poleZeroGain(r.system);
    // As in the analysis: a held charge's pole at the origin cancels against its zero (heldCharge.ts).
    const kept = heldCharges(net) > 0 ? cancelAtOrigin(pz.poles, pz.zeros) : pz;
    return { poles: kept.poles.sort(byMagnitude), zeros: kept.zeros.sort(byMagnitude) };
  } catch {
    return { poles: [], zeros: [] };
  }
}

export function sweepCompensation(
  model: DesignModel,
  target: CompensationTarget,
  values: readonly number[],
  token?: CancelToken,
): LocusPoint[] {
  const out: LocusPoint[] = [];
  if (target.field === 'cc') {
    const n0 = buildLoopNetwork(withValue(model, target, 0));
    const n1 = buildLoopNetwork(withValue(model, target, 1));
    if (n0.ok && n1.ok && n0.network.n === n1.network.n) {
      const a = n0.network;
      const dC = a.C.map((x, i) => n1.network.C[i] - x);
      const dIn = a.cIn.map((x, i) => n1.network.cIn[i] - x);
      const C = new Float64Array(a.C.length);
      const cIn = new Float64Array(a.cIn.length);
      for (const v of values) {
        if (token?.isCancellationRequested) break;
        for (let i = 0; i < C.length; i++) C[i] = a.C[i] + v * dC[i];
        for (let i = 0; i < cIn.length; i++) cIn[i] = a.cIn[i] + v * dIn[i];
        const capRank = v === 0 ? a.capRank : n1.network.capRank;
        out.push({ value: v, ...rootsOf({ ...a, C, cIn, capRank }) });
      }
      return out;
    }
  }
  for (const v of values) {
    if (token?.isCancellationRequested) break;
    const built = buildLoopNetwork(withValue(model, target, v));
    out.push({ value: v, ...(built.ok ? rootsOf(built.network) : { poles: [], zeros: [] }) });
  }
  return out;
}

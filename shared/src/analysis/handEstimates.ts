// The classic two-stage Miller hand formulas beside the exact roots they approximate. Formulas: dominant
// pole 1/(gm2·R1·R2·Cc), non-dominant pole gm2·Cc/(C1C2 + Cc(C1 + C2)), zero gm2/Cc or with a nulling
// resistor 1/(Cc(1/gm2 − Rz)) (Gray, Hurst, Lewis & Meyer ch. 9; Allen & Holberg ch. 6 — from memory).
import type { DesignModel } from '../language/model';
import type { Complex, HandEstimate } from './types';

export interface ClassicTwoStage {
  readonly gm1: number;
  readonly gm2: number;
  readonly r1: number;
  readonly r2: number;
  readonly c1: number;
  readonly c2: number;
  readonly cc: number;
  readonly rz: number;
}

const parallel = (a: number, b: number | undefined) => (b === undefined ? a : (a * b) / (a + b));

/** The model's values when it is exactly the classic two-stage Miller amplifier, else undefined. */
export function classicTwoStage(model: DesignModel): ClassicTwoStage | undefined {
  if (model.stages.length !== 2 || model.millers.length !== 1) return undefined;
  if (model.buffered.length > 0 || model.elements.length > 0) return undefined;
  const [s1, s2] = model.stages;
  const m = model.millers[0];
  if (s1.input.kind !== 'node' || s1.input.name !== model.input) return undefined;
  if (s2.input.kind !== 'node' || s2.input.name !== s1.name) return undefined;
  if (s2.name !== model.output || s2.polarity !== 'inverting') return undefined;
  const joins = (m.from === s1.name && m.to === s2.name) || (m.from === s2.name && m.to === s1.name);
  if (!joins || !(m.cc > 0)) return undefined;
  let r1: number = s1.rout;
  let r2: number = s2.rout;
  let c1: number = s1.cap;
  let c2: number = s2.cap;
  for (const l of model.loads) {
    if (l.node === s1.name) {
      r1 = parallel(r1, l.res);
      c1 += l.cap ?? 0;
    } else if (l.node === s2.name) {
      r2 = parallel(r2, l.res);
      c2 += l.cap ?? 0;
    } else return undefined;
  }
  return { gm1: s1.gm, gm2: s2.gm, r1, r2, c1, c2, cc: m.cc, rz: m.rz ?? 0 };
}

const mag = (s: Complex) => Math.hypot(s.re, s.im);

function estimate(
  quantity: HandEstimate['quantity'],
  formula: string,
  hand: number,
  exact: number,
): HandEstimate {
  let relativeError: number;
  if (hand === exact) relativeError = 0;
  else if (!Number.isFinite(exact) || !Number.isFinite(hand)) relativeError = 1;
  else relativeError = Math.abs(hand - exact) / Math.abs(exact);
  return { quantity, formula, hand, exact, relativeError };
}

/**
 * Hand estimates for the classic case. `poles` and `zeros` are the exact roots sorted by magnitude. When
 * no finite zero exists the exact zero is Infinity and the relative error of a finite estimate is given as
 * 1 (the estimate is wholly off).
 */
export function handEstimates(
  model: DesignModel,
  poles: readonly Complex[],
  zeros: readonly Complex[],
): HandEstimate[] | undefined {
  const t = classicTwoStage(model);
  if (!t || poles.length < 2) return undefined;
  const { gm2, r1, r2, c1, c2, cc, rz } = t;
  const out: HandEstimate[] = [
    estimate('dominant-pole', '1/(gm2·R1·R2·Cc)', 1 / (gm2 * r1 * r2 * cc), mag(poles[0])),
    estimate(
      'nondominant-pole',
      'gm2·Cc/(C1·C2 + Cc·(C1 + C2))',
      (gm2 * cc) / (c1 * c2 + cc * (c1 + c2)),
      mag(poles[1]),
    ),
  ];
  const hand = rz > 0 ? Math.abs(1 / (cc * (1 / gm2 - rz))) : gm2 / cc;
  const real = zeros.filter((z) => z.im === 0);
  let exact = Infinity;
  for (const z of real) {
    if (!Number.isFinite(exact) || Math.abs(Math.log(mag(z) / hand)) < Math.abs(Math.log(exact / hand)))
      exact = mag(z);
  }
  out.push(estimate('zero', rz > 0 ? '1/(Cc·(1/gm2 − Rz))' : 'gm2/Cc', hand, exact));
  return out;
}

// Pure variants of a model with one value changed: what the sweeps, the synthesis and quick fixes vary.
import type { DesignModel } from '../language/model';
import type { Farads, Ohms } from '../units';

import type { CompensationValue } from './compensation';

/** A compensation value of the model (kept under the name the sweeps and synthesis use). */
export type CompensationTarget = CompensationValue;

/** The model with one compensation value replaced; the model itself is not changed. */
export function withValue(model: DesignModel, target: CompensationTarget, value: number): DesignModel {
  if (target.kind === 'miller') {
    if (!model.millers[target.index]) return model;
    const millers = model.millers.map((m, i) => {
      if (i !== target.index) return m;
      return target.field === 'cc' ? { ...m, cc: value as Farads } : { ...m, rz: value as Ohms };
    });
    return { ...model, millers };
  }
  if (!model.buffered[target.index] || target.field !== 'cc') return model;
  const buffered = model.buffered.map((b, i) => (i === target.index ? { ...b, cc: value as Farads } : b));
  return { ...model, buffered };
}

/** The current value of a compensation target (undefined when the target does not exist). */
export function valueOf(model: DesignModel, target: CompensationTarget): number | undefined {
  if (target.kind === 'miller') {
    const m = model.millers[target.index];
    if (!m) return undefined;
    return target.field === 'cc' ? m.cc : (m.rz ?? 0);
  }
  const b = model.buffered[target.index];
  return b && target.field === 'cc' ? b.cc : undefined;
}

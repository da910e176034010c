// Which capacitor compensates a design: one definition for the quick fixes, the panel and the sweeps.
import type { BufferedCap, DesignModel, Miller } from '../language/model';

/** One compensation element of a design: its kind and its position among the elements of that kind. */
export interface CompensationElement {
  readonly kind: 'miller' | 'buffered';
  readonly index: number;
}

/** One value of a compensation element: a Miller capacitor's `cc` or `rz`, a buffered capacitor's `cc`. */
export interface CompensationValue extends CompensationElement {
  readonly field: 'cc' | 'rz';
}

export type Compensation =
  | { readonly kind: 'miller'; readonly index: number; readonly item: Miller }
  | { readonly kind: 'buffered'; readonly index: number; readonly item: BufferedCap };

/**
 * The capacitor that sets the dominant pole: a Miller capacitor into the output (the outer one of a nested
 * design), else the first Miller capacitor, else the first buffered one.
 */
export function primaryCompensation(model: DesignModel): Compensation | undefined {
  const intoOutput = model.millers.findIndex((m) => m.to === model.output);
  if (intoOutput >= 0) return { kind: 'miller', index: intoOutput, item: model.millers[intoOutput]! };
  if (model.millers.length) return { kind: 'miller', index: 0, item: model.millers[0]! };
  if (model.buffered.length) return { kind: 'buffered', index: 0, item: model.buffered[0]! };
  return undefined;
}

/** Whether the design has that element (a choice kept from an earlier text may no longer exist). */
export function hasCompensation(model: DesignModel, t: CompensationElement): boolean {
  const list = t.kind === 'miller' ? model.millers : model.buffered;
  return Number.isInteger(t.index) && t.index >= 0 && t.index < list.length;
}

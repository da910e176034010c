// What a solve makes small: the design's `minimize` expression, else the current the design draws (the sum
// of the stages' `bias` currents, when stages state one), else the compensation capacitance (area).
import type { DesignModel } from '../language/model';

export interface ObjectiveValue {
  readonly value: number;
  /** The expression as written, or the default in words. */
  readonly expression: string;
  /** The SI unit of the default objectives; empty for a written expression (its dimension is its own). */
  readonly unit: string;
}

export function objectiveOf(model: DesignModel): ObjectiveValue {
  if (model.minimize) return { value: model.minimize.value, expression: model.minimize.text, unit: '' };
  const biased = model.stages.filter((s) => s.bias !== undefined);
  if (biased.length)
    return {
      value: biased.reduce((sum, s) => sum + (s.bias ?? 0), 0),
      expression: 'the sum of the stages’ bias currents',
      unit: 'A',
    };
  const caps = [...model.millers.map((m) => m.cc), ...model.buffered.map((b) => b.cc)];
  return {
    value: caps.reduce((sum, c) => sum + c, 0),
    expression: 'the sum of the compensation capacitances',
    unit: 'F',
  };
}

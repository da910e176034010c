// How far a run is from a requirement's limit, normalised so that requirements of different kinds weigh
// alike in one search: ≥ 0 where the requirement holds. Frequencies, rates and times compare as log
// ratios; angles and decibels as differences over a scale of the same weight (30°, 10 dB, 20 dB of DC gain
// for about a factor e). Read from `measure`, so it judges exactly what the findings judge.
import type { DesignAnalysis } from '../analysis/types';
import type { Requirement } from '../language/model';
import { judge } from './measure';

/** Slack of an unmeasurable requirement: met (+1) or failed (−1), as `measure` judges it. */
const UNMEASURED = 1;

export function requirementSlack(req: Requirement, a: DesignAnalysis): number {
  const m = judge(req, a);
  const v = m.value;
  if (v === undefined || !Number.isFinite(v)) return m.pass ? UNMEASURED : -UNMEASURED;
  const signed = (d: number, op: '>=' | '<=') => (op === '>=' ? d : -d);
  switch (req.kind) {
    case 'ugf':
    case 'slew':
      return v > 0 ? signed(Math.log(v / req.value), req.op) : -UNMEASURED;
    case 'zero':
      return v > 0 ? Math.log(v / req.factor) : -UNMEASURED;
    case 'settle':
      return v > 0 ? Math.log(req.within / v) : -UNMEASURED;
    case 'pm':
      return signed((v - req.value) / 30, req.op);
    case 'gain-margin':
      return signed((v - req.value) / 10, req.op);
    case 'dc-gain':
    case 'closed-loop-gain':
      return signed((v - req.value) / 20, req.op);
    case 'supply-rejection':
      return signed((v - req.value) / 20, req.op);
    case 'output-impedance':
    case 'load-step':
      return v > 0 ? signed(Math.log(v / req.value), req.op) : UNMEASURED;
    default: {
      const never: never = req;
      return never;
    }
  }
}

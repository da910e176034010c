// The requirements on the closed loop as a whole (its DC gain, and for a loop written as a circuit its
// output impedance, supply rejection and load-step deviation): one table of what each is called and what
// moves it, judged by `judge` and worded by `measure` like every other requirement.
import type { Requirement } from '../language/model';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { judge, measure } from './measure';
import type { CheckCode } from './types';

type ClosedLoopKind = 'closed-loop-gain' | 'output-impedance' | 'supply-rejection' | 'load-step';

/** The check code of each kind (equal to the kind) and what usually moves the value, for the message. */
const ADVICE: Readonly<Record<ClosedLoopKind, string>> = {
  'closed-loop-gain': 'the feedback network sets it: change its ratio',
  'output-impedance':
    'the loop holds the output only where its gain is high: raise the loop gain or its crossover there, or add output capacitance',
  'supply-rejection':
    'the loop rejects the supply only as far as its gain reaches: raise the loop gain at that frequency, or weaken the path from the supply',
  'load-step':
    'the output capacitor carries the step until the loop responds: add output capacitance, or make the loop faster',
};

function closedLoopCheck(kind: ClosedLoopKind): Check {
  const code: CheckCode = kind;
  return (input: CheckInput) =>
    acrossRuns(input, code, (run): Hit[] => {
      const hits: Hit[] = [];
      run.model.requirements.forEach((req: Requirement, i) => {
        if (req.kind !== kind) return;
        const m = measure(req, run.analysis);
        if (m.pass) return;
        const j = judge(req, run.analysis);
        if (j.value === undefined) {
          hits.push({
            key: `unmeasured-${i}`,
            severity: 'warning',
            message: `The ${m.label} cannot be checked: ${m.measured}`,
            range: req.origin.range,
            related: [],
            badness: 0,
          });
          return;
        }
        hits.push({
          key: `fails-${i}`,
          severity: 'error',
          message: `The ${m.label} is ${m.measured}, which misses the required ${m.required}: ${ADVICE[kind]}`,
          range: req.origin.range,
          related: [],
          badness: Math.abs(j.value),
        });
      });
      return hits;
    });
}

export const closedLoopGainCheck = closedLoopCheck('closed-loop-gain');
export const outputImpedanceCheck = closedLoopCheck('output-impedance');
export const supplyRejectionCheck = closedLoopCheck('supply-rejection');
export const loadStepCheck = closedLoopCheck('load-step');

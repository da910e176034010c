// Open-loop DC gain against `require dc-gain`.
import { formatDb } from '../format/si';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { requirementOf, violates } from './locate';
import { gainDb } from '../units';

export const dcGainCheck: Check = (input: CheckInput) =>
  acrossRuns(input, 'dc-gain', (run): Hit[] => {
    const req = requirementOf(run.model, 'dc-gain');
    if (!req) return [];
    const db = gainDb(run.analysis.dcGain);
    if (!violates(req.op, db, req.value)) return [];
    return [
      {
        key: 'dc',
        severity: 'error',
        message: `Open-loop DC gain ${formatDb(db)} misses the required ${req.op} ${formatDb(req.value)}: raise gm·rout of a stage`,
        range: req.origin.range,
        related: run.model.stages.map((s) => ({
          range: s.origin.range,
          message: `stage ${s.name}: gm·rout = ${(s.gm * s.rout).toPrecision(3)} V/V`,
        })),
        badness: Math.abs(req.value - db),
      },
    ];
  });

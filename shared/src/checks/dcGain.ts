// Open-loop DC gain against `require dc-gain`. A gain of exactly zero (DC blocked) or infinity (a pole at
// the origin) is a state of the network, reported in words rather than as ±∞ dB.
import { formatDcGain, formatGain } from '../format/quantities';
import { formatDb } from '../format/si';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { requirementOf, violates } from './locate';
import { gainDb } from '../units';

export const dcGainCheck: Check = (input: CheckInput) =>
  acrossRuns(input, 'dc-gain', (run): Hit[] => {
    const req = requirementOf(run.model, 'dc-gain');
    if (!req) return [];
    const gain = run.analysis.dcGain;
    const required = `${req.op} ${formatDb(req.value)}`;
    const related = run.model.stages.map((s) => ({
      range: s.origin.range,
      message: `stage ${s.name}: gm·rout = ${formatGain(s.gm * s.rout)}`,
    }));
    if (Number.isNaN(gain)) {
      return [
        {
          key: 'unknown',
          severity: 'info',
          message: `Open-loop DC gain ${formatDcGain(gain)}: the requirement ${required} cannot be checked`,
          range: req.origin.range,
          related,
          badness: 0,
        },
      ];
    }
    const db = gainDb(gain);
    if (!violates(req.op, db, req.value)) return [];
    const finite = Number.isFinite(db);
    const advice =
      gain === 0
        ? 'a series capacitor, or a missing path, blocks DC between the input and the output'
        : !finite
          ? 'a node with no resistance to ground holds a pole at the origin'
          : req.op === '>='
            ? 'raise gm·rout of a stage'
            : 'lower gm·rout of a stage';
    return [
      {
        key: 'dc',
        severity: 'error',
        message: finite
          ? `Open-loop DC gain ${formatDb(db)} misses the required ${required}: ${advice}`
          : `Open-loop DC gain misses the required ${required}: ${formatDcGain(gain)} (${advice})`,
        range: req.origin.range,
        related,
        badness: finite ? Math.abs(req.value - db) : Number.MAX_VALUE,
      },
    ];
  });

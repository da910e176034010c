// Slew rate: the smallest I/C over the stages whose bias is given, SR = min(I_tail/Cc, I_2/(Cc + CL)) for
// a two-stage (AH), against `require slew`.
import { formatSlewRate } from '../format/quantities';
import { formatSi } from '../format/si';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { fieldRange, stageAt, requirementOf, violates } from './locate';

export const slewRateCheck: Check = (input: CheckInput) =>
  acrossRuns(input, 'slew-rate', (run): Hit[] => {
    const req = requirementOf(run.model, 'slew');
    if (!req) return [];
    const slew = run.analysis.slew;
    if (!slew || !slew.limits.length) {
      return [
        {
          key: 'unknown',
          severity: 'info',
          message: 'Slew rate cannot be checked: no stage states the bias current that charges its node',
          range: req.origin.range,
          related: [],
          badness: 0,
        },
      ];
    }
    if (!violates(req.op, slew.rate, req.value)) return [];
    const limit = [...slew.limits].sort((a, b) => a.rate - b.rate)[0]!;
    const stage = stageAt(run.model, limit.stage);
    const miss = Math.abs(req.value - slew.rate);
    return [
      {
        key: 'rate',
        severity: 'error',
        message:
          `Slew rate ${formatSlewRate(slew.rate)} misses the required ${req.op} ${formatSlewRate(req.value)}: stage ${limit.stage} ` +
          `charges ${formatSi(limit.cap, 'F')} from ${formatSi(limit.current, 'A')}`,
        range: stage ? fieldRange(stage.stage.origin, 'bias') : req.origin.range,
        related: [
          { range: req.origin.range, message: `required slew rate ${req.op} ${formatSlewRate(req.value)}` },
        ],
        // Relative miss; a required rate of zero (or an unbounded one) has none, so the absolute miss ranks.
        badness: req.value > 0 && Number.isFinite(req.value) ? miss / req.value : miss,
      },
    ];
  });

// Slew rate: the smallest I/C over the stages whose bias is given, SR = min(I_tail/Cc, I_2/(Cc + CL)) for
// a two-stage (AH), against `require slew`.
import { formatSi } from '../format/si';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { fieldRange, stageAt, requirementOf, violates } from './locate';

const perMicro = (rate: number) => `${(rate / 1e6).toPrecision(3)} V/µs`;

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
    return [
      {
        key: 'rate',
        severity: 'error',
        message:
          `Slew rate ${perMicro(slew.rate)} misses the required ${req.op} ${perMicro(req.value)}: stage ${limit.stage} ` +
          `charges ${formatSi(limit.cap, 'F')} from ${formatSi(limit.current, 'A')}`,
        range: stage ? fieldRange(stage.stage.origin, 'bias') : req.origin.range,
        related: [
          { range: req.origin.range, message: `required slew rate ${req.op} ${perMicro(req.value)}` },
        ],
        badness: Math.abs(req.value - slew.rate) / req.value,
      },
    ];
  });

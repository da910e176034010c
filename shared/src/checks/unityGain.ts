// The loop's unity-gain frequency against `require ugf`.
import { formatHz, formatSi } from '../format/si';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { compensationRange, primaryCompensation, requirementOf, stageAt } from './locate';
import { measure } from './measure';

export const unityGainCheck: Check = (input: CheckInput) =>
  acrossRuns(input, 'ugf', (run): Hit[] => {
    const req = requirementOf(run.model, 'ugf');
    if (!req) return [];
    // Judged as `measure` reads it: on the conservative crossing when the loop gain crosses 0 dB twice.
    const m = measure(req, run.analysis);
    if (m.pass) return [];
    const ugf = m.value;
    const comp = primaryCompensation(run.model);
    const first = comp ? stageAt(run.model, comp.item.from) : undefined;
    const gm1 = first?.stage.origin.fields['gm'];
    return [
      {
        key: 'ugf',
        severity: 'error',
        message:
          ugf === undefined
            ? `The loop gain never reaches 0 dB, so there is no unity-gain frequency (required ${req.op} ${formatHz(req.value)})`
            : `Unity-gain frequency ${m.measured} misses the required ${req.op} ${formatHz(req.value)}`,
        range: compensationRange(input.source, comp, run),
        related: [
          { range: req.origin.range, message: `required UGF ${req.op} ${formatHz(req.value)}` },
          ...(first && gm1
            ? [
                {
                  range: gm1.range,
                  message: `gm1 = ${formatSi(first.stage.gm, 'S')} sets the gain-bandwidth with Cc`,
                },
              ]
            : []),
        ],
        badness: ugf === undefined ? Infinity : Math.abs(Math.log(req.value / ugf)),
      },
    ];
  });

// Gain margin where the loop phase reaches −180°, and loops that cross unity more than once.
import { formatDb, formatHz } from '../format/si';
import type { DesignAnalysis } from '../analysis/types';
import type { CornerRun } from '../report';
import { acrossRuns, type Hit } from './acrossRuns';
import { ccForMarginFix } from './ccForMargin';
import type { Check } from './context';
import { addRequirementEdit, defined } from './fixes';
import { compensationRange, primaryCompensation, requirementOf, violates, judgedAsLoop } from './locate';

export const gainMarginCheck: Check = (input) =>
  acrossRuns(
    input,
    'gain-margin',
    (run): Hit[] => {
      if (!judgedAsLoop(run.model)) return [];
      const hits: Hit[] = [];
      const loop = run.analysis.loop;
      const req = requirementOf(run.model, 'gain-margin');
      const op = req?.op ?? '>=';
      const required = req?.value ?? input.settings.gainMargin;
      const range = compensationRange(input.source, primaryCompensation(run.model), run);
      const related = defined([
        req
          ? { range: req.origin.range, message: `required gain margin ${op} ${formatDb(required)}` }
          : undefined,
      ]);
      if (loop.gainMarginDb !== undefined && violates(op, loop.gainMarginDb, required)) {
        hits.push({
          key: 'margin',
          severity: loop.gainMarginDb <= 0 || req ? 'error' : 'warning',
          message:
            `Gain margin ${formatDb(loop.gainMarginDb)}` +
            (loop.phaseCrossoverHz !== undefined
              ? ` (phase −180° at ${formatHz(loop.phaseCrossoverHz)})`
              : '') +
            ` is below ${formatDb(required)}${req ? '' : ' (default)'}`,
          range,
          related,
          badness: required - loop.gainMarginDb,
        });
      }
      if (loop.crossings.length > 1) {
        hits.push({
          key: 'crossings',
          severity: 'warning',
          message:
            `The loop gain crosses 0 dB ${loop.crossings.length} times (` +
            loop.crossings.map((c) => `${formatHz(c.hz)} ${c.direction}`).join(', ') +
            '): margins are read at the last downward crossing, and a healthy first crossing does not make the loop stable',
          range,
          related,
          badness: loop.crossings.length,
        });
      }
      return hits;
    },
    ({ worst, worstRun }) => {
      if (worst.key !== 'margin') return [];
      const enough = (a: DesignAnalysis, run: CornerRun) => {
        const req = requirementOf(run.model, 'gain-margin');
        const gm = a.loop.gainMarginDb;
        return gm === undefined || !violates(req?.op ?? '>=', gm, req?.value ?? input.settings.gainMargin);
      };
      const line = `require gainmargin >= ${input.settings.gainMargin} dB`;
      return defined([
        ccForMarginFix(input, worstRun, enough, 'more gain margin'),
        requirementOf(worstRun.model, 'gain-margin')
          ? undefined
          : {
              title: `Add \`${line}\` (the default, stated)`,
              edits: [addRequirementEdit(input.source, worstRun.model, line)],
            },
      ]);
    },
  );

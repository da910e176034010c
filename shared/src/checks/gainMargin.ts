// Gain margin where the loop phase reaches −180°, and loops that cross unity more than once.
import { formatDb, formatHz } from '../format/si';
import { acrossRuns, type Hit } from './acrossRuns';
import { compensationFixes } from './compensationFixes';
import type { RuleSlack } from './solveKnob';
import type { Check } from './context';
import { defined } from './fixes';
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
            '): the loop is close to conditional stability, so requirements are read conservatively (a minimum UGF at the lowest downward crossing, the phase margin at the worst crossing), and a healthy first crossing does not make the loop stable',
          range,
          related,
          badness: loop.crossings.length,
        });
      }
      return hits;
    },
    ({ worst }) =>
      worst.key === 'margin'
        ? compensationFixes(input, gainMarginSlack(input.settings.gainMargin), 'the required gain margin')
        : [],
  );

/** The gain-margin rule's slack in one run, in dB; a phase that never reaches −180° meets any minimum. */
export function gainMarginSlack(fallback: number): RuleSlack {
  return {
    slack: (run) => {
      const req = requirementOf(run.model, 'gain-margin');
      const op = req?.op ?? '>=';
      const required = req?.value ?? fallback;
      const gm = run.analysis.loop.gainMarginDb;
      if (gm === undefined) return op === '>=' ? Infinity : NaN;
      return op === '>=' ? gm - required : required - gm;
    },
    describe: (run) => {
      const gm = run.analysis.loop.gainMarginDb;
      return gm === undefined ? 'phase never reaches −180°' : `gain margin ${formatDb(gm)}`;
    },
  };
}

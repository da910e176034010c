// Where a classic hand formula misleads: a pole is an eigenvalue of the whole network, and a formula tied
// to one node can be far off the exact value.
import { formatHz } from '../format/si';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { compensationRange, primaryCompensation } from './locate';

const QUANTITY = {
  'dominant-pole': 'dominant pole',
  'nondominant-pole': 'non-dominant pole',
  zero: 'zero',
} as const;

export const approximationCheck: Check = (input: CheckInput) =>
  acrossRuns(input, 'approximation', (run): Hit[] =>
    (run.analysis.hand ?? [])
      .filter((h) => Number.isFinite(h.relativeError) && h.relativeError > input.settings.approximationError)
      .map((h) => ({
        key: h.quantity,
        severity: 'info' as const,
        message:
          `The hand formula for the ${QUANTITY[h.quantity]}, ${h.formula}, gives ` +
          `${Number.isFinite(h.hand) ? formatHz(h.hand / (2 * Math.PI)) : '∞'}; the exact value is ` +
          `${formatHz(h.exact / (2 * Math.PI))} (${(h.relativeError * 100).toFixed(0)} % off): ` +
          'design with the exact value, the nodes share this root',
        range: compensationRange(input.source, primaryCompensation(run.model), run),
        related: [],
        badness: h.relativeError,
      })),
  );

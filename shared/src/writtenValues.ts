// Values chosen outside the text (the panel's sliders) are written into a design only when the design
// still reads and solves afterwards: the edit is applied to the design's text, parsed again and analysed
// once. Otherwise the user gets the reason and the file stays as it was.
import { analyzeDesign } from './analysis';
import { editDesignText } from './checks/fixes';
import type { TextEditSpec } from './checks/types';
import { parseDocument } from './language';
import { ANALYSABLE_MAGNITUDE } from './language/valueRanges';
import type { DesignSource } from './language/model';

/** Why `value` (SI) cannot be written as `what`, or undefined when it can. `zero`: 0 is allowed (no rz). */
export function unwritableValue(value: unknown, what: string, zero = false): string | undefined {
  if (typeof value !== 'number' || !Number.isFinite(value)) return `${what} is not a finite number`;
  if (value < 0) return `${what} is negative`;
  if (value === 0) return zero ? undefined : `${what} is zero`;
  if (value < ANALYSABLE_MAGNITUDE.low || value > ANALYSABLE_MAGNITUDE.high)
    return `${what} = ${value.toExponential(2)} lies outside the values a design can hold (magnitudes from 1e-30 to 1e30)`;
  return undefined;
}

const errorsOf = (text: string) =>
  parseDocument(text)
    .diagnostics.filter((d) => d.severity === 'error')
    .map((d) => d.message);

/**
 * Why `edits` must not be written into the design, or undefined when the edited design reads without a new
 * error and its nominal network still solves (when it solved before).
 */
export function refuseEdits(source: DesignSource, edits: readonly TextEditSpec[]): string | undefined {
  const text = editDesignText(source, edits);
  if (text === undefined) return 'the edit does not lie inside the design';
  const before = new Set(errorsOf(source.text));
  const parsed = parseDocument(text);
  const fresh = parsed.diagnostics.find((d) => d.severity === 'error' && !before.has(d.message));
  if (fresh) return `the written value would not read: ${fresh.message}`;
  const edited = parsed.designs[0]?.nominal;
  if (!edited) return 'the design would no longer read';
  if (!source.nominal) return undefined;
  const quick = { step: false, participation: false } as const;
  if (analyzeDesign(source.nominal, quick).problems.length) return undefined;
  const problem = analyzeDesign(edited, quick).problems[0];
  return problem ? `the network could not be solved with these values: ${problem.message}` : undefined;
}

// The joint fix: on every requirement finding of a design that has free parameters, one edit of the free
// parameters' values that meets every requirement in every corner at once ("Meet all requirements: …"),
// solved when first asked for and shared by the design's findings.
import { withLazyFixes } from '../checks/acrossRuns';
import type { CheckSettings } from '../checks/settings';
import type { CheckCode, Finding, FixSuggestion } from '../checks/types';
import type { DesignSource } from '../language/model';
import { solveDesign, type DesignSolve } from './solveDesign';

/** The findings a joint solve answers: requirements and the loop's own verdicts. */
const ANSWERED = new Set<CheckCode>([
  'stability',
  'phase-margin',
  'gain-margin',
  'ugf',
  'dc-gain',
  'slew-rate',
  'settling',
  'rhp-zero',
]);

export function hasFreeParameters(source: DesignSource): boolean {
  return source.nominal?.params.some((p) => p.free) ?? false;
}

/** The fix a solve gives: the changed values as one edit, or why no values meet everything. */
export function solveFixOf(solve: DesignSolve): FixSuggestion {
  if (solve.status !== 'met')
    return {
      title: 'Meet all requirements by solving the free parameters',
      edits: [],
      disabled: solve.note ?? 'no values within the bounds meet every requirement',
    };
  const changed = solve.values.filter((v) => v.afterText !== v.beforeText);
  const list = (changed.length ? changed : solve.values).map((v) => `${v.name} = ${v.afterText}`).join(', ');
  return {
    title: `Meet all requirements: ${list}`,
    edits: solve.edits.filter((_, i) => solve.values[i]!.afterText !== solve.values[i]!.beforeText),
    preferred: true,
  };
}

/**
 * The design's findings with the joint fix added to those it answers, first among their fixes; the
 * solve runs once, when the first of them is read.
 */
export function withSolveFix(
  findings: readonly Finding[],
  source: DesignSource,
  settings: CheckSettings,
): Finding[] {
  if (!hasFreeParameters(source)) return [...findings];
  let memo: FixSuggestion | undefined;
  const joint = () => (memo ??= solveFixOf(solveDesign(source, { settings })));
  return findings.map((f) => {
    if (!ANSWERED.has(f.code) || f.severity === 'info') return f;
    // The single-value fixes stay where they are the right answer; the joint one is preferred. The base
    // is copied field by field: spreading the finding would read (and solve) its fixes now.
    const base: Omit<Finding, 'fixes'> = {
      code: f.code,
      severity: f.severity,
      message: f.message,
      range: f.range,
      related: f.related,
      ...(f.design !== undefined ? { design: f.design } : {}),
      ...(f.corners ? { corners: f.corners } : {}),
    };
    return withLazyFixes(base, () => [joint(), ...f.fixes.map(({ preferred: _, ...rest }) => rest)]);
  });
}

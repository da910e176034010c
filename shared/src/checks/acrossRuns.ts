// Merges what one rule finds in each corner into one finding per subject, naming the corners it holds in.
import type { SourceRange } from '../language/source';
import type { CornerRun } from '../report';
import type { CheckInput } from './context';
import type { CheckCode, Finding, FixSuggestion, Severity } from './types';

/** What a rule finds in one run. Hits with the same `key` in different runs become one finding. */
export interface Hit {
  readonly key: string;
  readonly severity: Severity;
  readonly message: string;
  readonly range: SourceRange;
  readonly related: readonly { readonly range: SourceRange; readonly message: string }[];
  /** Larger is worse: the worst run's message is shown and its model is the one fixes are solved on. */
  readonly badness: number;
}

export interface HitGroup {
  readonly worst: Hit;
  readonly worstRun: CornerRun;
  /** Every run in which the rule holds. */
  readonly failing: readonly CornerRun[];
}

const SEVERITY_RANK: Record<Severity, number> = { info: 0, warning: 1, error: 2 };

export function describeCorners(names: readonly string[]): string {
  const corners = names.filter((n) => n !== 'nominal');
  const parts: string[] = [];
  if (names.includes('nominal')) parts.push('nominal');
  if (corners.length) parts.push(`corner${corners.length > 1 ? 's' : ''} ${corners.join(', ')}`);
  return parts.join(' and ');
}

/**
 * Run `evaluate` on every run, group the hits by key and build one finding per key. A finding that holds
 * only in some runs lists them in `corners` and says so; one that holds everywhere names the worst corner
 * when the design has corners.
 */
export function acrossRuns(
  input: CheckInput,
  code: CheckCode,
  evaluate: (run: CornerRun) => readonly Hit[],
  fixesFor?: (group: HitGroup) => readonly FixSuggestion[],
): Finding[] {
  const groups = new Map<string, { hits: Hit[]; runs: CornerRun[] }>();
  for (const run of input.runs) {
    if (run.analysis.problems.length) continue;
    for (const hit of evaluate(run)) {
      const g = groups.get(hit.key) ?? { hits: [], runs: [] };
      g.hits.push(hit);
      g.runs.push(run);
      groups.set(hit.key, g);
    }
  }
  const analysed = input.runs.filter((r) => !r.analysis.problems.length);
  const findings: Finding[] = [];
  for (const { hits, runs } of groups.values()) {
    let w = 0;
    for (let i = 1; i < hits.length; i++) if (hits[i]!.badness > hits[w]!.badness) w = i;
    const worst = hits[w]!;
    const worstRun = runs[w]!;
    const severity = hits.reduce<Severity>(
      (s, h) => (SEVERITY_RANK[h.severity] > SEVERITY_RANK[s] ? h.severity : s),
      'info',
    );
    const names = runs.map((r) => r.corner);
    const partial = runs.length < analysed.length;
    let message = worst.message;
    if (partial) message += ` (only in ${describeCorners(names)})`;
    else if (analysed.length > 1) message += ` (in every corner; worst: ${worstRun.corner})`;
    findings.push(
      withLazyFixes(
        {
          code,
          severity,
          message,
          design: input.source.name,
          range: worst.range,
          related: worst.related,
          ...(partial ? { corners: names } : {}),
        },
        fixesFor ? () => fixesFor({ worst, worstRun, failing: runs }) : () => [],
      ),
    );
  }
  return findings;
}

/**
 * A finding whose fixes are solved the first time they are read (a code action, the terminal checker's
 * JSON): solving runs the exact analysis many times, and most findings are shown without their fixes.
 * A fix that cannot be solved is simply not offered; the finding itself stands.
 */
export function withLazyFixes(base: Omit<Finding, 'fixes'>, solve: () => readonly FixSuggestion[]): Finding {
  let memo: readonly FixSuggestion[] | undefined;
  return {
    ...base,
    get fixes() {
      if (!memo) {
        try {
          memo = solve();
        } catch {
          memo = [];
        }
      }
      return memo;
    },
  };
}

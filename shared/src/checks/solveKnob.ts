// A fix solved on the quantity of its own rule: the knob's literal is rewritten in the design's text, the
// text parsed and analysed again in every corner, and the rule's slack (≥ 0 where it holds) taken at the
// worst run. Every window of values that meets the rule is found (feasibleWindows); the edge nearest the
// present value is rounded to 3 significant digits towards the inside of its window, re-checked, and
// preferred when it breaks no other stated requirement.
import { feasibleWindows } from '../analysis/feasibleWindows';
import type { CornerRun } from '../report';
import type { CheckInput } from './context';
import { newlyBroken, rerunEdited } from './fixes';
import type { Knob } from './knobs';
import type { FixSuggestion, TextEditSpec } from './types';

export interface RuleSlack {
  /** ≥ 0 where the run meets the rule, larger is better; NaN where the rule cannot be judged. */
  readonly slack: (run: CornerRun) => number;
  /** The rule's own quantity in a run, as text (`gain margin 10.0 dB`). */
  readonly describe: (run: CornerRun) => string;
}

export type KnobOutcome =
  | { readonly ok: true; readonly fix: FixSuggestion; readonly clean: boolean; readonly change: number }
  | { readonly ok: false; readonly reason: string };

/** How far from the present value the scan looks, each way (a factor). */
const SPAN = 100;
/**
 * Scan density: 6 a decade resolves any window wider than 1/6 decade directly; narrower ones show as a
 * near-miss maximum, which feasibleWindows refines.
 */
const PER_DECADE = 6;
/** Window edges tried, nearest first. */
const MAX_CANDIDATES = 4;

/** A closed loop that is not stable meets no rule, whatever its margins read. */
function judged(rule: RuleSlack, run: CornerRun): number {
  const verdict = run.analysis.stability?.verdict;
  if (verdict === 'unstable' || verdict === 'marginal') return -Infinity;
  return rule.slack(run);
}

export function worstRun(rule: RuleSlack, runs: readonly CornerRun[]): { run: CornerRun; slack: number } {
  let worst = { run: runs[0]!, slack: Infinity };
  for (const run of runs) {
    const s = judged(rule, run);
    const v = Number.isNaN(s) ? -Infinity : s;
    if (v < worst.slack || worst.slack === Infinity) worst = { run, slack: v };
  }
  return worst;
}

export function solveKnob(
  input: CheckInput,
  knob: Knob,
  rule: RuleSlack,
  title: (valueText: string, achieved: string) => string,
): KnobOutcome {
  const engine = input.engine;
  if (!engine) return { ok: false, reason: 'no analysis engine to solve with' };
  if (!(knob.value > 0)) return { ok: false, reason: `${knob.name} is zero, so it cannot be scaled` };
  const edit = (v: number): TextEditSpec[] => [{ range: knob.range, newText: knob.write(v) }];
  const memo = new Map<number, { slack: number; runs?: CornerRun[] }>();
  const evaluate = (v: number) => {
    const hit = memo.get(v);
    if (hit) return hit;
    const runs = rerunEdited(input.source, edit(v), engine);
    const result = runs ? { slack: worstRun(rule, runs).slack, runs } : { slack: NaN };
    memo.set(v, result);
    return result;
  };
  let lo = knob.value / SPAN;
  let hi = knob.value * SPAN;
  const f = (v: number) => evaluate(v).slack;
  // A knob that moves nothing where the rule fails (a corner that sets its own value) needs no scan.
  const now = worstRun(rule, input.runs);
  const ends = [evaluate(lo), evaluate(hi)];
  if (ends.every((e) => e.runs && sameSlack(worstRun(rule, e.runs).slack, now.slack))) {
    return {
      ok: false,
      reason:
        now.run.corner === 'nominal'
          ? `changing ${knob.name} leaves it unchanged`
          : `changing ${knob.name} leaves it unchanged in corner ${now.run.corner}, where it fails (a corner that overrides a value keeps its own)`,
    };
  }
  let scan = feasibleWindows(f, lo, hi, PER_DECADE);
  // The best value at an end of the scan means the rule improves beyond it: look once more that way.
  if (!scan.windows.length && scan.best && scan.best.f > -Infinity) {
    const atTop = scan.best.x >= hi / 1.5;
    const atBottom = scan.best.x <= lo * 1.5;
    if (atTop || atBottom) {
      const [a, b] = atTop ? [hi, hi * SPAN] : [lo / SPAN, lo];
      const more = feasibleWindows(f, a, b, PER_DECADE);
      lo = Math.min(lo, a);
      hi = Math.max(hi, b);
      if (more.windows.length || (more.best && more.best.f > scan.best.f)) scan = more;
    }
  }
  const candidates: { x: number; towards: 'up' | 'down' }[] = [];
  for (const w of scan.windows) {
    if (w.loIsEdge) candidates.push({ x: w.lo, towards: 'up' });
    if (w.hiIsEdge) candidates.push({ x: w.hi, towards: 'down' });
  }
  if (!candidates.length) {
    const best = scan.best && evaluate(scan.best.x).runs;
    const at = best ? worstRun(rule, best).run : undefined;
    const where = scan.best
      ? ` (the best, near ${knob.name} = ${knob.write(round3(scan.best.x))}, gives ${at ? rule.describe(at) : 'no usable result'})`
      : '';
    return {
      ok: false,
      reason: `no value of ${knob.name} from ${knob.write(round3(lo))} to ${knob.write(round3(hi))} meets it${where}${overridingCorners(input, knob)}`,
    };
  }
  candidates.sort((a, b) => Math.abs(Math.log(a.x / knob.value)) - Math.abs(Math.log(b.x / knob.value)));
  let fallback: KnobOutcome | undefined;
  for (const c of candidates.slice(0, MAX_CANDIDATES)) {
    for (const v of roundedTowards(c.x, c.towards)) {
      const { slack, runs } = evaluate(v);
      if (!runs || !(slack >= 0)) continue;
      const worst = worstRun(rule, runs).run;
      const corner = runs.length > 1 ? ` in the worst corner, ${worst.corner}` : '';
      const base = title(knob.write(v), `${rule.describe(worst)}${corner}`);
      const broken = newlyBroken(input.runs, runs);
      const change = Math.abs(Math.log(v / knob.value));
      const fix = { title: broken.length ? `${base} — but ${broken.join('; ')}` : base, edits: edit(v) };
      if (!broken.length) return { ok: true, fix, clean: true, change };
      fallback ??= { ok: true, fix, clean: false, change };
      break;
    }
  }
  return (
    fallback ?? {
      ok: false,
      reason: `${knob.name} meets it only in windows whose rounded ends fail again on re-analysis`,
    }
  );
}

const round3 = (x: number) => Number(x.toPrecision(3));

/** `; corner slow sets its own gm3` when corners override the knob's parameter (the edit cannot reach them). */
function overridingCorners(input: CheckInput, knob: Knob): string {
  const names = input.source.corners
    .filter((c) => c.origin.fields[knob.name] !== undefined)
    .map((c) => c.name);
  if (!names.length) return '';
  return `; corner${names.length > 1 ? 's' : ''} ${names.join(', ')} set${names.length > 1 ? '' : 's'} ${names.length > 1 ? 'their' : 'its'} own ${knob.name}`;
}

/** Equal to rounding; an infinite slack (no such root at all) equals only itself. */
const sameSlack = (a: number, b: number) =>
  a === b ||
  (Number.isFinite(a) && Number.isFinite(b) && Math.abs(a - b) <= 1e-12 * Math.max(Math.abs(a), Math.abs(b)));

/** 3-significant-digit values at and beyond `x` in the direction that goes into its window. */
function roundedTowards(x: number, towards: 'up' | 'down'): number[] {
  const step = 10 ** (Math.floor(Math.log10(x)) - 2);
  const first = towards === 'up' ? Math.ceil(x / step - 1e-9) * step : Math.floor(x / step + 1e-9) * step;
  const dir = towards === 'up' ? 1 : -1;
  return [0, 1, 2].map((k) => round3(first + dir * k * step)).filter((v) => v > 0);
}

/**
 * Fixes from several knobs for one rule: every knob that solves, the cleanest smallest change preferred;
 * when none solves, one reason per knob.
 */
export function fixesFromKnobs(outcomes: readonly KnobOutcome[]): {
  fixes: FixSuggestion[];
  reasons: string[];
} {
  const solved = outcomes.filter((o): o is Extract<KnobOutcome, { ok: true }> => o.ok);
  const reasons = outcomes
    .filter((o): o is Extract<KnobOutcome, { ok: false }> => !o.ok)
    .map((o) => o.reason);
  if (!solved.length) return { fixes: [], reasons };
  const ranked = [...solved].sort((a, b) => Number(b.clean) - Number(a.clean) || a.change - b.change);
  const best = ranked[0]!;
  return {
    fixes: solved.map((o) => (o === best ? { ...o.fix, preferred: true } : o.fix)),
    reasons: [],
  };
}

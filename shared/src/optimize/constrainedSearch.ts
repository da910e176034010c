// Least objective subject to constraints over a box of a few variables, without derivatives: the margins
// of an amplifier are smooth but not convex in its component values, their feasible regions may be
// disjoint, and one evaluation is an exact analysis in every corner (tens of microseconds to a
// millisecond), so a few thousand evaluations are affordable and a gradient is not.
//
// Method (a pattern search with an extreme barrier, as in the generalised pattern search and mesh adaptive
// direct search families of derivative-free optimisation):
//  1. Explore: a space-filling sample of the box (a scrambled Halton sequence, 16 + 8·2ⁿ points, plus the
//     centre and the starting point), so that every feasible region larger than the sample spacing is seen.
//  2. From the best few feasible samples, poll the 2n coordinate directions at a step that halves on
//     failure; a move is taken only when it stays feasible and lowers the objective (extreme barrier: an
//     infeasible point is never accepted). The optimum of these problems usually lies on a constraint
//     boundary (less current until a margin just holds); after the polls stall, each coordinate is pushed
//     towards lower objective by bisection to the boundary, which the halving polls approach only slowly.
//  3. With no feasible sample, the same search maximises the smallest constraint (the best compromise) and
//     the constraints negative there are the ones that cannot be met together.
// Every loop is bounded by an evaluation budget.

export interface Problem {
  /** Number of variables; each lives in [0, 1] (the caller maps to its own scale). */
  readonly dimension: number;
  /** Objective and constraints at x; a constraint holds when ≥ 0. NaN anywhere counts as infeasible. */
  readonly evaluate: (x: readonly number[]) => { objective: number; constraints: readonly number[] };
  /** The starting point (the values as written), tried first. */
  readonly start?: readonly number[];
}

export interface SearchOptions {
  readonly budget?: number;
  /** Stop when the poll step falls below this (in the unit box; 1e-3 is below the 3-digit rounding of a value spanning two decades). */
  readonly tolerance?: number;
  readonly isCancelled?: () => boolean;
}

export interface Point {
  readonly x: readonly number[];
  readonly objective: number;
  readonly constraints: readonly number[];
  /** The smallest constraint: ≥ 0 when feasible. */
  readonly worst: number;
}

export type SearchResult =
  | { readonly feasible: true; readonly best: Point; readonly evaluations: number }
  | { readonly feasible: false; readonly best: Point; readonly evaluations: number };

const worstOf = (cs: readonly number[]) => {
  let w = Infinity;
  for (const c of cs) w = Number.isNaN(c) ? -Infinity : Math.min(w, c);
  return w;
};

/** Radical inverse in base b with a fixed digit scramble: a low-discrepancy sequence, deterministic. */
function halton(index: number, base: number): number {
  let f = 1;
  let r = 0;
  let i = index;
  while (i > 0) {
    f /= base;
    const digit = i % base;
    r += f * ((digit * 7 + 3) % base);
    i = Math.floor(i / base);
  }
  return r;
}
const PRIMES = [2, 3, 5, 7, 11, 13, 17, 19, 23, 29];

export function constrainedSearch(problem: Problem, options: SearchOptions = {}): SearchResult {
  const n = problem.dimension;
  const budget = options.budget ?? 1500;
  // A step below this cannot move a double in [0, 1] meaningfully; it also keeps the polls finite.
  const tolerance = Math.max(options.tolerance ?? 1e-3, 1e-9);
  let evaluations = 0;
  const clamp = (v: number) => (v < 0 ? 0 : v > 1 ? 1 : v);
  const memo = new Map<string, Point>();
  const at = (x: readonly number[]): Point => {
    const key = x.map((v) => v.toFixed(12)).join(',');
    const hit = memo.get(key);
    if (hit) return hit;
    evaluations++;
    const r = problem.evaluate(x);
    const p: Point = {
      x: [...x],
      objective: Number.isNaN(r.objective) ? Infinity : r.objective,
      constraints: r.constraints,
      worst: worstOf(r.constraints),
    };
    memo.set(key, p);
    return p;
  };
  const exhausted = () => evaluations >= budget || options.isCancelled?.() === true;

  // 1. Explore.
  const samples: Point[] = [];
  if (problem.start) samples.push(at(problem.start.map(clamp)));
  samples.push(at(Array.from({ length: n }, () => 0.5)));
  const count = Math.min(Math.floor(budget / 3), 16 + 8 * 2 ** Math.min(n, 4));
  for (let i = 1; i <= count && !exhausted(); i++) {
    samples.push(at(Array.from({ length: n }, (_, d) => halton(i, PRIMES[d % PRIMES.length]!))));
  }
  const feasible = samples.filter((p) => p.worst >= 0);
  // Feasible: lower objective is better, and at the same objective more room in the tightest
  // constraint (a variable the objective does not depend on moves to where the others can go further).
  // Infeasible: a larger smallest constraint is better.
  const same = (a: number, b: number) =>
    a === b || Math.abs(a - b) <= 1e-12 * Math.max(Math.abs(a), Math.abs(b));
  const better = feasible.length
    ? (a: Point, b: Point) =>
        a.worst >= 0 &&
        (b.worst < 0 || (same(a.objective, b.objective) ? a.worst > b.worst : a.objective < b.objective))
    : (a: Point, b: Point) => a.worst > b.worst;
  const starts = [...(feasible.length ? feasible : samples)]
    .sort((a, b) => (better(a, b) ? -1 : better(b, a) ? 1 : 0))
    .slice(0, 4);

  // 2. Poll from each start; keep the best.
  let best = starts[0]!;
  for (const start of starts) {
    if (exhausted()) break;
    const found = poll(start, better, at, exhausted, n, tolerance, clamp);
    if (better(found, best)) best = found;
  }
  return { feasible: best.worst >= 0, best, evaluations } as SearchResult;
}

function poll(
  start: Point,
  better: (a: Point, b: Point) => boolean,
  at: (x: readonly number[]) => Point,
  exhausted: () => boolean,
  n: number,
  tolerance: number,
  clamp: (v: number) => number,
): Point {
  let current = start;
  let step = 0.125;
  while (step >= tolerance && !exhausted()) {
    let moved = false;
    for (let d = 0; d < n && !exhausted(); d++) {
      for (const dir of [-1, 1]) {
        const x = [...current.x];
        x[d] = clamp(x[d]! + dir * step);
        if (x[d] === current.x[d]) continue;
        const p = at(x);
        if (better(p, current)) {
          current = p;
          moved = true;
          break;
        }
      }
    }
    if (!moved) {
      const pushed =
        current.worst >= 0 ? pushToBoundary(current, at, exhausted, n, clamp, tolerance) : current;
      if (better(pushed, current)) current = pushed;
      else step /= 2;
    }
  }
  return current;
}

/**
 * Move each coordinate towards lower objective as far as the constraints allow, by bisection between the
 * feasible point and the box edge (the objective's direction is read from a small probe).
 */
function pushToBoundary(
  current: Point,
  at: (x: readonly number[]) => Point,
  exhausted: () => boolean,
  n: number,
  clamp: (v: number) => number,
  tolerance: number,
): Point {
  let p = current;
  for (let d = 0; d < n && !exhausted(); d++) {
    const probe = [...p.x];
    const h = Math.max(tolerance, 1e-3);
    probe[d] = clamp(probe[d]! - h);
    const down = probe[d] !== p.x[d] ? at(probe) : p;
    const dir = down.objective < p.objective ? -1 : 1;
    const edge = [...p.x];
    edge[d] = dir < 0 ? 0 : 1;
    if (edge[d] === p.x[d]) continue;
    const end = at(edge);
    if (end.worst >= 0 && end.objective < p.objective) {
      p = end;
      continue;
    }
    let good = p.x[d]!;
    let bad = edge[d]!;
    for (let k = 0; k < 40 && Math.abs(bad - good) > tolerance / 4 && !exhausted(); k++) {
      const mid = (good + bad) / 2;
      const x = [...p.x];
      x[d] = mid;
      const q = at(x);
      if (q.worst >= 0 && q.objective <= p.objective) good = mid;
      else bad = mid;
    }
    if (good !== p.x[d]) {
      const x = [...p.x];
      x[d] = good;
      const q = at(x);
      if (q.worst >= 0 && q.objective < p.objective) p = q;
    }
  }
  return p;
}

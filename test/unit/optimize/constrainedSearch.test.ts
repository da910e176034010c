// The constrained search on problems whose optimum is known in closed form.
import { describe, expect, it } from 'vitest';
import { constrainedSearch } from '../../../shared/src/optimize/constrainedSearch';

describe('constrainedSearch', () => {
  it('meets a constraint at its boundary: min x + y subject to x·y ≥ 1/4 is 1 at x = y = 1/2', () => {
    // By the AM–GM inequality x + y ≥ 2√(xy) = 1, with equality at x = y = 1/2.
    const r = constrainedSearch({
      dimension: 2,
      evaluate: ([x, y]) => ({ objective: x! + y!, constraints: [x! * y! - 0.25] }),
      start: [0.9, 0.9],
    });
    expect(r.feasible).toBe(true);
    expect(r.best.objective).toBeLessThan(1 + 2e-3);
    expect(r.best.objective).toBeGreaterThanOrEqual(1 - 1e-9);
  });

  it('finds the lower of two disjoint feasible windows', () => {
    // Feasible only within 0.03 of 0.2 or within 0.1 of 0.7: the least x is 0.17.
    const r = constrainedSearch({
      dimension: 1,
      evaluate: ([x]) => ({
        objective: x!,
        constraints: [Math.max(0.03 - Math.abs(x! - 0.2), 0.1 - Math.abs(x! - 0.7))],
      }),
      start: [0.9],
    });
    expect(r.feasible).toBe(true);
    expect(Math.abs(r.best.x[0]! - 0.17)).toBeLessThan(1e-3);
  });

  it('reports infeasible with the best compromise when constraints conflict', () => {
    // x ≥ 0.8 and x ≤ 0.2 cannot hold together; the smallest violation of both is at x = 0.5.
    const r = constrainedSearch({
      dimension: 1,
      evaluate: ([x]) => ({ objective: x!, constraints: [x! - 0.8, 0.2 - x!] }),
    });
    expect(r.feasible).toBe(false);
    expect(Math.abs(r.best.x[0]! - 0.5)).toBeLessThan(1e-3);
    expect(r.best.constraints.every((c) => c < 0)).toBe(true);
  });

  it('stays within its evaluation budget', () => {
    let calls = 0;
    constrainedSearch(
      {
        dimension: 4,
        evaluate: (x) => {
          calls++;
          return { objective: x.reduce((a, b) => a + b, 0), constraints: [Math.sin(20 * x[0]!) - 0.99] };
        },
      },
      { budget: 300 },
    );
    expect(calls).toBeLessThanOrEqual(300);
  });
});

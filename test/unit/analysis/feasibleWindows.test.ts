// Every window where a rule holds, on functions whose windows are known in closed form.
import { describe, expect, it } from 'vitest';
import { feasibleWindows } from '../../../shared/src/analysis/feasibleWindows';

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe('feasibleWindows', () => {
  it('finds one window with its edges: 1 − (ln x)² ≥ 0 on [1/e, e]', () => {
    const { windows } = feasibleWindows((x) => 1 - Math.log(x) ** 2, 1e-2, 1e2);
    expect(windows).toHaveLength(1);
    expect(rel(windows[0]!.lo, Math.exp(-1))).toBeLessThan(1e-8);
    expect(rel(windows[0]!.hi, Math.exp(1))).toBeLessThan(1e-8);
    expect(windows[0]!.loIsEdge && windows[0]!.hiIsEdge).toBe(true);
  });

  it('finds disjoint windows: cos(2π·log10 x) ≥ 1/2 where log10 x lies within 1/6 of an integer', () => {
    const { windows } = feasibleWindows((x) => Math.cos(2 * Math.PI * Math.log10(x)) - 0.5, 3, 3000);
    // Windows around 10 (log 1), 100 (log 2) and 1000 (log 3): edges at 10^(k ± 1/6).
    expect(windows).toHaveLength(3);
    windows.forEach((w, i) => {
      const k = i + 1;
      expect(rel(w.lo, 10 ** (k - 1 / 6))).toBeLessThan(1e-8);
      expect(rel(w.hi, 10 ** (k + 1 / 6))).toBeLessThan(1e-8);
    });
  });

  it('finds a window narrower than the scan step', () => {
    // 1e-6 − (log10 x − 1.537)² ≥ 0 only within 0.001 decade of 10^1.537, far below 1/8 decade.
    const { windows } = feasibleWindows((x) => 1e-6 - (Math.log10(x) - 1.537) ** 2, 1, 1000, 8);
    expect(windows).toHaveLength(1);
    expect(rel(windows[0]!.lo, 10 ** (1.537 - 0.001))).toBeLessThan(1e-6);
    expect(rel(windows[0]!.hi, 10 ** (1.537 + 0.001))).toBeLessThan(1e-6);
  });

  it('reports an open end and no window where the rule never holds, with the best sample', () => {
    const open = feasibleWindows((x) => Math.log10(x) - 1, 1, 1000);
    expect(open.windows).toHaveLength(1);
    expect(open.windows[0]!.hiIsEdge).toBe(false);
    expect(rel(open.windows[0]!.lo, 10)).toBeLessThan(1e-8);
    const none = feasibleWindows((x) => -1 - (Math.log10(x) - 2) ** 2, 1, 1e4);
    expect(none.windows).toEqual([]);
    expect(rel(none.best!.x, 100)).toBeLessThan(1e-3);
  });

  it('treats points where the rule cannot be judged (NaN) as failing', () => {
    const { windows } = feasibleWindows((x) => (x > 50 && x < 60 ? NaN : 1 - Math.log10(x) / 3), 1, 1e4);
    // Holds below 1000 except the unjudged gap: two windows, split at 50 and 60.
    expect(windows).toHaveLength(2);
    expect(windows[0]!.hi).toBeLessThanOrEqual(50);
    expect(windows[1]!.lo).toBeGreaterThanOrEqual(60);
    expect(rel(windows[1]!.hi, 1000)).toBeLessThan(1e-8);
  });
});

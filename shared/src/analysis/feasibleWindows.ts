// Every window of a positive value where a rule holds (f ≥ 0), found on a logarithmic scan and refined by
// Brent at each edge. Margins are smooth but not monotonic in a component value (a phase margin that rises
// and falls again with Cc), so a solver that stops at the first crossing misses the windows after it. A
// window narrower than the scan step shows as a local maximum of f just below zero between two samples:
// each such maximum is refined by golden-section search before it is given up.
import { brentRoot, goldenMax } from '../numeric/roots';

export interface Window {
  /** Lowest value that meets the rule (the scan's end when the window is open there). */
  readonly lo: number;
  readonly hi: number;
  /** True for an edge where the rule changes (not the end of the scanned range). */
  readonly loIsEdge: boolean;
  readonly hiIsEdge: boolean;
}

export interface WindowScan {
  readonly windows: readonly Window[];
  /** The best sample of the scan (largest f), for saying why no window exists. */
  readonly best?: { readonly x: number; readonly f: number };
}

/** Brent needs finite values: an unjudged or failing-without-measure point stands in as just failing. */
const bounded = (y: number) => (y === Infinity ? 1 : Number.isFinite(y) ? y : -1);

/** f is NaN where the rule cannot be judged; such points count as not meeting it. */
const judged = (y: number) => (Number.isNaN(y) ? -Infinity : y);

export function feasibleWindows(
  f: (x: number) => number,
  lo: number,
  hi: number,
  perDecade = 12,
): WindowScan {
  const n = Math.max(2, Math.ceil(Math.log10(hi / lo) * perDecade) + 1);
  const us = Array.from({ length: n }, (_, i) => Math.log(lo) + (i / (n - 1)) * Math.log(hi / lo));
  const g = (u: number) => judged(f(Math.exp(u)));
  const ys = us.map(g);
  let best: { x: number; f: number } | undefined;
  ys.forEach((y, i) => {
    if (y > -Infinity && (!best || y > best.f)) best = { x: Math.exp(us[i]!), f: y };
  });
  // Samples that meet the rule, after hidden windows between samples are opened up by inserting the
  // maximum that golden search finds there.
  const points: { u: number; y: number }[] = us.map((u, i) => ({ u, y: ys[i]! }));
  for (let i = 1; i + 1 < n; i++) {
    const y = ys[i]!;
    if (!(y < 0 && y > -Infinity && y >= ys[i - 1]! && y >= ys[i + 1]!)) continue;
    const peak = goldenMax(g, us[i - 1]!, us[i + 1]!, 1e-9, 80);
    if (peak.value >= 0) points.push({ u: peak.x, y: peak.value });
    if (!best || peak.value > best.f) best = { x: Math.exp(peak.x), f: peak.value };
  }
  points.sort((a, b) => a.u - b.u);
  const edge = (a: { u: number; y: number }, b: { u: number; y: number }): number => {
    // Brent needs finite end values: an unjudged end stands in as just failing.
    const ya = bounded(a.y);
    const yb = bounded(b.y);
    const h = (u: number) => bounded(g(u));
    return brentRoot(h, a.u, b.u, ya, yb, 1e-10);
  };
  const windows: Window[] = [];
  let start: { u: number; isEdge: boolean } | undefined;
  for (let i = 0; i < points.length; i++) {
    const p = points[i]!;
    const meets = p.y >= 0;
    if (meets && !start) {
      start = i === 0 ? { u: p.u, isEdge: false } : { u: edge(points[i - 1]!, p), isEdge: true };
    }
    if (!meets && start) {
      const end = edge(points[i - 1]!, p);
      windows.push(closeWindow(start, end, true, g));
      start = undefined;
    }
  }
  if (start) windows.push(closeWindow(start, points[points.length - 1]!.u, false, g));
  return { windows, ...(best ? { best } : {}) };
}

/**
 * A Brent edge is the root to 1e-10 in ln x but may sit on either side of it: nudge each edge inward
 * until it meets the rule, so that a window's ends are values that hold.
 */
function closeWindow(
  start: { u: number; isEdge: boolean },
  endU: number,
  hiIsEdge: boolean,
  g: (u: number) => number,
): Window {
  const inward = (u: number, dir: 1 | -1) => {
    let step = 1e-9;
    for (let k = 0; k < 20 && g(u) < 0; k++, step *= 4) u += dir * step;
    return u;
  };
  const loU = start.isEdge ? inward(start.u, 1) : start.u;
  const hiU = hiIsEdge ? inward(endU, -1) : endU;
  return { lo: Math.exp(loU), hi: Math.exp(Math.max(loU, hiU)), loIsEdge: start.isEdge, hiIsEdge };
}

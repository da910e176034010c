// What every benchmark prints its figures with: medians per call, wall and CPU time, and the machine's load
// (the machine is shared, so a figure means little without it). Benchmarks print; they never judge.
import { loadavg } from 'node:os';

export const median = (xs: readonly number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

/** Microseconds for people: `812.3 µs`, `4.85 ms`. */
export const us = (x: number) => (x >= 1000 ? `${(x / 1000).toFixed(2)} ms` : `${x.toFixed(1)} µs`);

/**
 * Median wall time per call over `batches` batches of `perBatch` calls, after a warm-up batch, and the
 * median CPU time per call of the same batches.
 */
export function perCall(f: () => unknown, perBatch: number, batches = 15): string {
  for (let i = 0; i < perBatch; i++) f();
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let b = 0; b < batches; b++) {
    const c = process.cpuUsage();
    const t = performance.now();
    for (let i = 0; i < perBatch; i++) f();
    wall.push(((performance.now() - t) * 1000) / perBatch);
    const u = process.cpuUsage(c);
    cpu.push((u.user + u.system) / perBatch);
  }
  return `${us(median(wall))} wall, ${us(median(cpu))} CPU`;
}

/** The 1-, 5- and 15-minute load averages, as the figures' context. */
export const loadAverage = () =>
  loadavg()
    .map((x) => x.toFixed(2))
    .join(' ');

// A small test runner for the extension host: named checks run in order, each with its own timeout, and
// the outcome of every check is written to a JSON file that the outer runner reads and counts.
import { writeFileSync } from 'node:fs';

export interface CheckResult {
  readonly name: string;
  readonly ok: boolean;
  readonly ms: number;
  readonly error?: string;
}

type CheckFn = () => Promise<void>;

export class Suite {
  private readonly checks: { name: string; fn: CheckFn; timeoutMs: number }[] = [];

  check(name: string, fn: CheckFn, timeoutMs = 30_000): void {
    this.checks.push({ name, fn, timeoutMs });
  }

  async run(resultsPath: string | undefined, log: (line: string) => void): Promise<CheckResult[]> {
    const results: CheckResult[] = [];
    for (const c of this.checks) {
      const started = Date.now();
      let timer: NodeJS.Timeout | undefined;
      try {
        await Promise.race([
          c.fn(),
          new Promise<never>((_, reject) => {
            timer = setTimeout(() => reject(new Error(`timed out after ${c.timeoutMs} ms`)), c.timeoutMs);
          }),
        ]);
        results.push({ name: c.name, ok: true, ms: Date.now() - started });
        log(`  ok    ${c.name}`);
      } catch (err) {
        const error = err instanceof Error ? (err.stack ?? err.message) : String(err);
        results.push({ name: c.name, ok: false, ms: Date.now() - started, error });
        log(`  FAIL  ${c.name}\n        ${error.split('\n').slice(0, 6).join('\n        ')}`);
      } finally {
        if (timer) clearTimeout(timer);
      }
      if (resultsPath) writeFileSync(resultsPath, JSON.stringify(results, null, 2));
    }
    return results;
  }
}

/** Polls `probe` until it returns a value other than undefined, or fails with the last reason. */
export async function waitFor<T>(
  what: string,
  probe: () => T | undefined | Promise<T | undefined>,
  timeoutMs = 20_000,
  everyMs = 100,
): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  let lastError: unknown;
  for (;;) {
    try {
      const value = await probe();
      if (value !== undefined) return value;
    } catch (err) {
      lastError = err;
    }
    if (Date.now() > deadline) {
      const why = lastError instanceof Error ? `: ${lastError.message}` : '';
      throw new Error(`waited ${timeoutMs} ms for ${what}${why}`);
    }
    await new Promise((r) => setTimeout(r, everyMs));
  }
}

export function assert(condition: unknown, message: string): asserts condition {
  if (!condition) throw new Error(message);
}

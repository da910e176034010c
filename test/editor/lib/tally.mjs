// Counts named checks and prints each as it finishes; the runner prints the closing `N passed, N failed`.
export class Tally {
  passed = 0;
  failed = 0;
  /** @type {{ name: string, ok: boolean, error?: string }[]} */
  results = [];

  pass(name, ms) {
    this.passed += 1;
    this.results.push({ name, ok: true });
    console.log(`  ok    ${name}${ms === undefined ? '' : ` (${(ms / 1000).toFixed(1)} s)`}`);
  }

  fail(name, error) {
    this.failed += 1;
    const text = error instanceof Error ? error.message : String(error);
    this.results.push({ name, ok: false, error: text });
    console.log(`  FAIL  ${name}\n        ${text.split('\n').slice(0, 12).join('\n        ')}`);
  }

  /**
   * Runs `fn`; a throw or a timeout is a failure. Returns fn's value (true when it returns nothing), or
   * undefined when it failed.
   */
  async check(name, fn, timeoutMs = 60_000) {
    let timer;
    const started = Date.now();
    try {
      const value = await Promise.race([
        fn(),
        new Promise((_, reject) => {
          timer = setTimeout(() => reject(new Error(`timed out after ${timeoutMs / 1000} s`)), timeoutMs);
        }),
      ]);
      this.pass(name, Date.now() - started);
      return value === undefined ? true : value;
    } catch (err) {
      this.fail(name, err);
      return undefined;
    } finally {
      clearTimeout(timer);
    }
  }
}

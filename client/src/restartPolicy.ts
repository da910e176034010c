// How often a crashed language server is restarted: at most `maxRestarts` times within `windowMs`, then the
// client gives up and says so. Pure, so the policy is tested without an editor.
export interface RestartPolicy {
  /** Record a crash at `now` (ms); true when the server should be restarted. */
  shouldRestart(now: number): boolean;
  /** Crashes counted in the current window. */
  readonly recent: number;
}

export function boundedRestarts(maxRestarts: number, windowMs: number): RestartPolicy {
  let crashes: number[] = [];
  return {
    shouldRestart(now: number): boolean {
      crashes = crashes.filter((t) => now - t < windowMs);
      crashes.push(now);
      return crashes.length <= maxRestarts;
    },
    get recent() {
      return crashes.length;
    },
  };
}
